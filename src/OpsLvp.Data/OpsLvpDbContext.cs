using Microsoft.EntityFrameworkCore;
using OpsLvp.Data.Entities;

namespace OpsLvp.Data;

/// <summary>
/// The OpsLvp database: readings, the audit chain, the engine state row and feed health. Tables and columns are
/// snake_case. Configure with <see cref="OpsLvpDatabase"/>; migrations live in this assembly.
/// </summary>
public sealed class OpsLvpDbContext(DbContextOptions<OpsLvpDbContext> options) : DbContext(options)
{
    public DbSet<ReadingRow> Readings => Set<ReadingRow>();

    public DbSet<AuditEntryRow> AuditEntries => Set<AuditEntryRow>();

    public DbSet<EngineStateRow> EngineState => Set<EngineStateRow>();

    public DbSet<FeedHealthRow> FeedHealth => Set<FeedHealthRow>();

    protected override void ConfigureConventions(ModelConfigurationBuilder configurationBuilder)
    {
        configurationBuilder.Properties<DateTimeOffset>().HaveConversion<UtcTextConverter>();
    }

    protected override void OnModelCreating(ModelBuilder modelBuilder)
    {
        modelBuilder.Entity<ReadingRow>(e =>
        {
            e.ToTable("readings");
            e.HasKey(r => r.Id);
            e.Property(r => r.Id).HasColumnName("id");
            e.Property(r => r.Time).HasColumnName("time");
            e.Property(r => r.ReceivedAt).HasColumnName("received_at");
            e.Property(r => r.Source).HasColumnName("source");
            e.Property(r => r.Sensor).HasColumnName("sensor");
            e.Property(r => r.Kind).HasColumnName("kind");
            e.Property(r => r.Value).HasColumnName("value");
            e.Property(r => r.Status).HasColumnName("status");
            e.Property(r => r.Accepted).HasColumnName("accepted");
            e.Property(r => r.RejectReason).HasColumnName("reject_reason");
            e.Property(r => r.RejectDetail).HasColumnName("reject_detail");
            e.HasIndex(r => new { r.Sensor, r.Kind, r.Time }).HasDatabaseName("ix_readings_sensor_kind_time");
            e.HasIndex(r => r.ReceivedAt).HasDatabaseName("ix_readings_received_at");
        });

        modelBuilder.Entity<AuditEntryRow>(e =>
        {
            e.ToTable("audit_entries", t => t.HasCheckConstraint("ck_audit_entries_sequence", "sequence >= 1"));
            e.HasKey(a => a.Sequence);
            e.Property(a => a.Sequence).HasColumnName("sequence").ValueGeneratedNever();
            e.Property(a => a.Time).HasColumnName("time");
            e.Property(a => a.Actor).HasColumnName("actor");
            e.Property(a => a.Kind).HasColumnName("kind");
            e.Property(a => a.PayloadJson).HasColumnName("payload_json");
            e.Property(a => a.PreviousHash).HasColumnName("previous_hash");
            e.Property(a => a.Hash).HasColumnName("hash");
            e.HasIndex(a => a.Time).HasDatabaseName("ix_audit_entries_time");
        });

        modelBuilder.Entity<EngineStateRow>(e =>
        {
            e.ToTable("engine_state", t => t.HasCheckConstraint("ck_engine_state_single_row", "id = 1"));
            e.HasKey(s => s.Id);
            e.Property(s => s.Id).HasColumnName("id").ValueGeneratedNever();
            e.Property(s => s.StateJson).HasColumnName("state_json");
            e.Property(s => s.AuditSequence).HasColumnName("audit_sequence");
            e.Property(s => s.ProfileVersion).HasColumnName("profile_version");
            e.Property(s => s.SavedAt).HasColumnName("saved_at");
        });

        modelBuilder.Entity<FeedHealthRow>(e =>
        {
            e.ToTable("feed_health");
            e.HasKey(f => f.Feed);
            e.Property(f => f.Feed).HasColumnName("feed");
            e.Property(f => f.LastGoodAt).HasColumnName("last_good_at");
            e.Property(f => f.ConsecutiveFailures).HasColumnName("consecutive_failures");
            e.Property(f => f.LastError).HasColumnName("last_error");
            e.Property(f => f.LastErrorAt).HasColumnName("last_error_at");
        });
    }
}
