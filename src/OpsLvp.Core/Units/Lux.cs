namespace OpsLvp.Core.Units;

/// <summary>An illuminance in lux (lx = cd·sr/m²), e.g. the eye's illuminance threshold E_T.</summary>
public readonly record struct Lux(double Value) : IComparable<Lux>
{
    /// <inheritdoc />
    public int CompareTo(Lux other) => Value.CompareTo(other.Value);

    /// <inheritdoc />
    public override string ToString() => $"{Value:G4} lx";
}
