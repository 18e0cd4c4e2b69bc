namespace OpsLvp.Core.Units;

/// <summary>A distance in metres. Finite; negative values are allowed only where a caller documents them.</summary>
public readonly record struct Metres(double Value) : IComparable<Metres>
{
    /// <inheritdoc />
    public int CompareTo(Metres other) => Value.CompareTo(other.Value);

    public static bool operator <(Metres a, Metres b) => a.Value < b.Value;
    public static bool operator >(Metres a, Metres b) => a.Value > b.Value;
    public static bool operator <=(Metres a, Metres b) => a.Value <= b.Value;
    public static bool operator >=(Metres a, Metres b) => a.Value >= b.Value;

    /// <inheritdoc />
    public override string ToString() => $"{Value:0.#} m";
}
