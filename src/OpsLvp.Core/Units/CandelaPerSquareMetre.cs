namespace OpsLvp.Core.Units;

/// <summary>A luminance in candela per square metre (cd/m²), e.g. the background luminance seen by a pilot.</summary>
public readonly record struct CandelaPerSquareMetre(double Value) : IComparable<CandelaPerSquareMetre>
{
    /// <inheritdoc />
    public int CompareTo(CandelaPerSquareMetre other) => Value.CompareTo(other.Value);

    /// <inheritdoc />
    public override string ToString() => $"{Value:G4} cd/m²";
}
