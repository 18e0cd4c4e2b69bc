namespace OpsLvp.Core.Presentation;

/// <summary>
/// The states a screen names, one step finer than <see cref="Engine.Phase"/>: the engine's phase plus what the
/// status says about safeguards and manual relaxation. Each has exactly one entry in <see cref="LvpVocabulary"/>.
/// </summary>
public enum LvpState
{
    /// <summary>No LVP episode: normal operations.</summary>
    Normal,

    /// <summary>Preparing: safeguarding the airfield while conditions deteriorate.</summary>
    Preparation,

    /// <summary>The conditions for LVP hold but mandatory preparation safeguards are still open: LVP are not yet in force.</summary>
    ConditionsMetSafeguardsIncomplete,

    /// <summary>LVP in force (conditions met and safeguards complete).</summary>
    InForce,

    /// <summary>LVP cancelled; protective measures being withdrawn.</summary>
    Cancellation,
}
