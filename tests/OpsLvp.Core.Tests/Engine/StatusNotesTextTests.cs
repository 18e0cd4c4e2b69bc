using OpsLvp.Core.Engine;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>docs/engine.md R13: the note beside the phase names open safeguards by their texts when the screen knows them (invented profile).</summary>
public class StatusNotesTextTests
{
    [Fact]
    public void OpenSafeguards_AreNamedByTheirItemTexts_WhenGiven()
    {
        var profile = TestProfiles.Safeguarded();
        var d = new EngineDriver(profile);
        d.WeatherFromTo(0, 120, 500);
        var status = d.Engine.Describe(d.State, EngineDriver.At(120));
        var texts = profile.Checklists.Preparation.ToDictionary(i => i.Id, i => i.Text);

        Assert.Equal(
            ["LVP conditions met — safeguards incomplete: Suspend airside works (invented); Check stop bars (invented) open"],
            StatusNotes.For(status, id => texts.GetValueOrDefault(id)));
        // an item the screen does not know keeps its id
        Assert.Equal(
            ["LVP conditions met — safeguards incomplete: Suspend airside works (invented); P2 open"],
            StatusNotes.For(status, id => id == "P1" ? texts["P1"] : null));
    }
}

/// <summary>docs/reliability.md "Storage faults": while nothing is recorded the phase beside the note is the last recorded one.</summary>
public class NotRecordingNoteTests
{
    [Fact]
    public void StorageFailing_PutsTheLastRecordedNoteFirst_AndOnlyThen()
    {
        var profile = TestProfiles.Safeguarded();
        var d = new EngineDriver(profile);
        d.WeatherFromTo(0, 120, 500);
        var status = d.Engine.Describe(d.State, EngineDriver.At(120));
        Assert.DoesNotContain(StatusNotes.For(status), n => n.StartsWith(StatusNotes.NotRecordingNote, StringComparison.Ordinal));

        var failing = status with
        {
            Alarms = [.. status.Alarms, new Alarm("audit-failing", AlarmKind.AuditStorageFailing, "not recording: disk full", EngineDriver.At(100))],
        };
        var notes = StatusNotes.For(failing);

        Assert.Equal(2, notes.Count);
        Assert.StartsWith(StatusNotes.NotRecordingNote + " ", notes[0], StringComparison.Ordinal);
        Assert.Equal(StatusNotes.NotRecordingNote + " " + EngineDriver.At(100).UtcDateTime.ToString("HH:mm:ss'Z'", System.Globalization.CultureInfo.InvariantCulture), notes[0]);
        Assert.StartsWith("LVP conditions met", notes[1], StringComparison.Ordinal);
    }
}
