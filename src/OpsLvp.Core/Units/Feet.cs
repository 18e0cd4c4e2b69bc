namespace OpsLvp.Core.Units;

/// <summary>A height in feet (above aerodrome level unless a caller says otherwise).</summary>
public readonly record struct Feet(double Value) : IComparable<Feet>
{
    /// <summary>Feet per metre: 1 ft = 0.3048 m exactly (international foot).</summary>
    public const double MetresPerFoot = 0.3048;

    /// <inheritdoc />
    public int CompareTo(Feet other) => Value.CompareTo(other.Value);

    /// <summary>The same height in metres.</summary>
    public Metres ToMetres() => new(Value * MetresPerFoot);

    public static bool operator <(Feet a, Feet b) => a.Value < b.Value;
    public static bool operator >(Feet a, Feet b) => a.Value > b.Value;
    public static bool operator <=(Feet a, Feet b) => a.Value <= b.Value;
    public static bool operator >=(Feet a, Feet b) => a.Value >= b.Value;

    /// <inheritdoc />
    public override string ToString() => $"{Value:0.#} ft";
}
