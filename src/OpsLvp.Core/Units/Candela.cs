namespace OpsLvp.Core.Units;

/// <summary>A luminous intensity in candela (cd). Finite and not negative where a caller says so.</summary>
public readonly record struct Candela(double Value) : IComparable<Candela>
{
    /// <inheritdoc />
    public int CompareTo(Candela other) => Value.CompareTo(other.Value);

    /// <inheritdoc />
    public override string ToString() => $"{Value:0.#} cd";
}
