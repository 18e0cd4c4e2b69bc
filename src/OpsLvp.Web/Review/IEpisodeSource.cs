namespace OpsLvp.Web.Review;

/// <summary>Where the review reads the record from (the database in the app; an in-memory record in tests).</summary>
public interface IEpisodeSource
{
    Task<ReviewRecord> LoadAsync(CancellationToken cancellationToken = default);
}
