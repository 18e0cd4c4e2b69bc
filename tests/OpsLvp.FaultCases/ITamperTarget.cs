namespace OpsLvp.FaultCases;

/// <summary>
/// A data folder a real server recorded into and stopped, as a <see cref="TamperCase"/> sees it: the in-process app of
/// the Web tests (<c>TamperedFolder</c>) or the server process of the fault runner (<see cref="TamperRun"/>).
/// </summary>
public interface ITamperTarget
{
    /// <summary>The SQLite file.</summary>
    string Database { get; }

    /// <summary>The anchor log beside the data folder (default layout, docs/audit.md "Anchors").</summary>
    string AnchorLog { get; }

    /// <summary>The RVR sensor whose 900 m and 400 m readings drove preparation and LVP in force.</summary>
    string TdzSensor { get; }

    /// <summary>Runs SQL on the stopped server's file (<see cref="TamperFiles.SqlAsync"/>).</summary>
    Task<object?> SqlAsync(string sql);

    /// <summary>Starts the server once more on the folder and stops it orderly.</summary>
    Task StartAndStopAsync();
}
