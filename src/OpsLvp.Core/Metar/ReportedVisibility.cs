using OpsLvp.Core.Reporting;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Metar;

/// <summary>
/// A prevailing visibility as written in a report or forecast: <see cref="Distance"/> in metres (statute miles converted
/// at 1609.344 m), <see cref="Qualifier"/> for <c>M</c> (less than) or <c>P</c> / <c>9999</c> (that much or more), and
/// <see cref="StatuteMiles"/> as written when the group was in miles (null for metres).
/// </summary>
public sealed record ReportedVisibility(Metres Distance, RvrQualifier? Qualifier, double? StatuteMiles);
