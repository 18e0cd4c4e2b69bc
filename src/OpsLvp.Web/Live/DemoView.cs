namespace OpsLvp.Web.Live;

/// <summary>Demo mode: the clock runs <paramref name="Speed"/> times faster than real time.</summary>
public sealed record DemoView(double Speed);
