namespace OpsLvp.Web.Time;

/// <summary>Whether the app runs in demo mode (simulator on, accelerated clock) and at which speed.</summary>
public sealed record DemoMode(bool Enabled, double Speed)
{
    /// <summary>Badge text for the layout, e.g. <c>DEMO ×30</c>; null outside demo mode.</summary>
    public string? BadgeText => Enabled ? string.Create(System.Globalization.CultureInfo.InvariantCulture, $"DEMO ×{Speed:0.##}") : null;
}
