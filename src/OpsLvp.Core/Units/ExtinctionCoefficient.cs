namespace OpsLvp.Core.Units;

/// <summary>
/// An atmospheric extinction coefficient σ. Stored per metre; sensors and readings give it per kilometre
/// (<see cref="FromPerKm"/>). Always finite and strictly positive: σ = 0 (perfectly clear air) has no finite
/// MOR and is rejected.
/// </summary>
public readonly record struct ExtinctionCoefficient : IComparable<ExtinctionCoefficient>
{
    private ExtinctionCoefficient(double perMetre) => PerMetre = perMetre;

    /// <summary>σ in m⁻¹.</summary>
    public double PerMetre { get; }

    /// <summary>σ in km⁻¹ (the unit of <c>ReadingKind.Extinction</c>).</summary>
    public double PerKm => PerMetre * 1000.0;

    /// <summary>From σ in m⁻¹. Throws <see cref="ArgumentOutOfRangeException"/> unless finite and &gt; 0.</summary>
    public static ExtinctionCoefficient FromPerMetre(double perMetre)
    {
        if (!double.IsFinite(perMetre) || perMetre <= 0)
        {
            throw new ArgumentOutOfRangeException(nameof(perMetre), perMetre, "extinction coefficient must be a finite number greater than 0");
        }
        return new ExtinctionCoefficient(perMetre);
    }

    /// <summary>From σ in km⁻¹. Throws <see cref="ArgumentOutOfRangeException"/> unless finite and &gt; 0.</summary>
    public static ExtinctionCoefficient FromPerKm(double perKm)
    {
        if (!double.IsFinite(perKm) || perKm <= 0)
        {
            throw new ArgumentOutOfRangeException(nameof(perKm), perKm, "extinction coefficient must be a finite number greater than 0 (per km)");
        }
        return new ExtinctionCoefficient(perKm / 1000.0);
    }

    /// <inheritdoc />
    public int CompareTo(ExtinctionCoefficient other) => PerMetre.CompareTo(other.PerMetre);

    /// <inheritdoc />
    public override string ToString() => $"{PerKm:G4} /km";
}
