using System.Text.Json.Nodes;
using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Tests.Profile;

public sealed class ProfileLoaderTests
{
    private static JsonObject ValidJson() => JsonNode.Parse(ProfileLoader.Serialize(ProfileFixtures.Valid()))!.AsObject();

    private static ProfileException ParseFails(JsonNode json) =>
        Assert.Throws<ProfileException>(() => ProfileLoader.Parse(json.ToJsonString()));

    [Fact]
    public void SerializedProfile_ParsesBackToTheSameJson()
    {
        var json = ProfileLoader.Serialize(ProfileFixtures.Valid());
        Assert.Equal(json, ProfileLoader.Serialize(ProfileLoader.Parse(json)));
    }

    [Fact]
    public void UnknownEnumValue_NamesThePathAndTheAllowedValues()
    {
        var json = ValidJson();
        json["sensors"]![1]!["type"] = "laserBeam";
        var ex = ParseFails(json);
        Assert.Equal("sensors[1].type", ex.Field);
        Assert.Contains("'forwardScatter'", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void UnknownProperty_NamesThePathAndTheProperty()
    {
        var json = ValidJson();
        json["thresholds"]!["active"]!["rvrBelowFt"] = 1800;
        var ex = ParseFails(json);
        Assert.StartsWith("thresholds.active", ex.Field, StringComparison.Ordinal);
        Assert.Contains("unknown property 'rvrBelowFt'", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void UnknownReadingKindInMaxAges_NamesThePath()
    {
        var json = ValidJson();
        json["maxAgeSeconds"]!["fogginess"] = 60;
        var ex = ParseFails(json);
        Assert.StartsWith("maxAgeSeconds", ex.Field, StringComparison.Ordinal);
    }

    [Fact]
    public void WrongValueType_NamesThePath()
    {
        var json = ValidJson();
        json["thresholds"]!["preparation"]!["enterDwellSeconds"] = "a minute";
        var ex = ParseFails(json);
        Assert.Equal("thresholds.preparation.enterDwellSeconds", ex.Field);
        Assert.Contains("wrong value type", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void MissingConfirm_IsAParseError_NamingIt_WhileAnEmptyListIsAccepted()
    {
        // docs/engine.md R14: each aerodrome decides explicitly which transitions need confirmation
        var json = ValidJson();
        json.Remove("confirm");
        var ex = ParseFails(json);
        Assert.Contains("'confirm'", ex.Message, StringComparison.Ordinal);
        json["confirm"] = new JsonArray();
        Assert.Empty(ProfileLoader.Parse(json.ToJsonString()).Confirm);
    }

    [Fact]
    public void InForceNeedsSafeguards_DefaultsToTrue()
    {
        // docs/engine.md R13
        var json = ValidJson();
        json.Remove("inForceNeedsSafeguards");
        Assert.True(ProfileLoader.Parse(json.ToJsonString()).InForceNeedsSafeguards);
    }

    [Fact]
    public void MissingSensorId_IsAParseErrorNamingTheSensor()
    {
        var json = ValidJson();
        json["sensors"]![0]!.AsObject().Remove("id");
        var ex = ParseFails(json);
        Assert.StartsWith("sensors[0]", ex.Field, StringComparison.Ordinal);
        Assert.Contains("id", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void NullChecklistText_IsAParseErrorNamingTheItem()
    {
        var json = ValidJson();
        json["checklists"]!["active"]![0]!["text"] = null;
        var ex = ParseFails(json);
        Assert.StartsWith("checklists.active[0]", ex.Field, StringComparison.Ordinal);
    }

    [Fact]
    public void MissingThresholds_IsAParseError()
    {
        var json = ValidJson();
        json.Remove("thresholds");
        var ex = ParseFails(json);
        Assert.Contains("thresholds", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void BrokenSyntax_IsAProfileException()
    {
        var ex = Assert.Throws<ProfileException>(() => ProfileLoader.Parse("{ \"version\": "));
        Assert.False(string.IsNullOrWhiteSpace(ex.Message));
    }

    [Fact]
    public void JsonNull_IsAProfileException()
    {
        var ex = Assert.Throws<ProfileException>(() => ProfileLoader.Parse("null"));
        Assert.Equal("$", ex.Field);
    }
}
