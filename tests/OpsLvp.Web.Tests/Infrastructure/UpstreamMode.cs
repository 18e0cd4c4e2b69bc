namespace OpsLvp.Web.Tests.Infrastructure;

/// <summary>What the fake upstream feed answers.</summary>
public enum UpstreamMode
{
    GoodJson,
    Http500,
    Hang,
    Garbage,
    PartiallyMalformed,
}
