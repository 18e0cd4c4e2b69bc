namespace OpsLvp.Web.Feeds;

/// <summary>A push client: its name (health and batch source <c>push:{Name}</c>) and its secret key.</summary>
public sealed class PushApiKey
{
    public string Name { get; set; } = "";

    public string Key { get; set; } = "";
}
