using System.Text.Json;
using OpsLvp.Core.Capability;
using OpsLvp.Core.Presentation;

namespace OpsLvp.Core.Engine.Replay;

/// <summary>
/// The fields of a <c>capability_changed</c> event line (docs/replay.md): per runway direction that changed, its
/// headline before and after, and after it every operation with its reasons (worded by <see cref="CapabilityWords"/>).
/// </summary>
public static class CapabilityJson
{
    public static void Write(Utf8JsonWriter w, CapabilityChanged e)
    {
        ArgumentNullException.ThrowIfNull(w);
        ArgumentNullException.ThrowIfNull(e);
        w.WriteStartArray("directions");
        foreach (var after in e.After)
        {
            var before = e.Before.FirstOrDefault(b => b.Direction == after.Direction);
            if (before is not null && CapabilityEvaluator.Same([before], [after]))
            {
                continue;
            }
            w.WriteStartObject();
            w.WriteString("direction", after.Direction);
            w.WriteBoolean("in_use", after.InUse);
            if (before is null)
            {
                w.WriteNull("before");
            }
            else
            {
                w.WriteString("before", CapabilityWords.Summary(before));
            }
            w.WriteString("after", CapabilityWords.Summary(after));
            w.WriteStartArray("operations");
            foreach (var op in after.Operations)
            {
                w.WriteStartObject();
                w.WriteString("operation", CapabilityWords.Operation(op.Kind));
                w.WriteBoolean("available", op.Available);
                if (op.UsesObserverRvr)
                {
                    w.WriteBoolean("observer_rvr", true);
                }
                w.WriteStartArray("reasons");
                foreach (var r in op.Reasons)
                {
                    w.WriteStringValue(CapabilityWords.Reason(r));
                }
                w.WriteEndArray();
                w.WriteEndObject();
            }
            w.WriteEndArray();
            w.WriteEndObject();
        }
        w.WriteEndArray();
    }
}
