using System.Text;
using Microsoft.AspNetCore.DataProtection.EntityFrameworkCore;
using Microsoft.AspNetCore.Identity;
using Microsoft.AspNetCore.Identity.EntityFrameworkCore;
using Microsoft.EntityFrameworkCore;
using OpsLvp.Data.Entities;

namespace OpsLvp.Data;

/// <summary>
/// The OpsLvp database: readings, the audit chain, the engine state row, feed health, and access control (the
/// ASP.NET Core Identity tables, display tokens, API keys) and the data-protection key ring (so a re-created container
/// keeps sessions and forms valid). Tables and columns are snake_case. Configure with
/// <see cref="OpsLvpDatabase"/>; migrations live in this assembly.
/// </summary>
public sealed class OpsLvpDbContext(DbContextOptions<OpsLvpDbContext> options) : IdentityDbContext<OpsLvpUser>(options), IDataProtectionKeyContext
{
    public DbSet<DataProtectionKey> DataProtectionKeys => Set<DataProtectionKey>();

    public DbSet<ReadingRow> Readings => Set<ReadingRow>();

    public DbSet<AuditEntryRow> AuditEntries => Set<AuditEntryRow>();

    public DbSet<EngineStateRow> EngineState => Set<EngineStateRow>();

    public DbSet<EngineLeadershipRow> EngineLeadership => Set<EngineLeadershipRow>();

    public DbSet<ReadingInboxRow> ReadingInbox => Set<ReadingInboxRow>();

    public DbSet<FeedHealthRow> FeedHealth => Set<FeedHealthRow>();

    public DbSet<DisplayTokenRow> DisplayTokens => Set<DisplayTokenRow>();

    public DbSet<ApiKeyRow> ApiKeys => Set<ApiKeyRow>();

    protected override void ConfigureConventions(ModelConfigurationBuilder configurationBuilder)
    {
        configurationBuilder.Properties<DateTimeOffset>().HaveConversion<UtcTextConverter>();
    }

    protected override void OnModelCreating(ModelBuilder modelBuilder)
    {
        base.OnModelCreating(modelBuilder);
        MapIdentityTables(modelBuilder);
        modelBuilder.Entity<DataProtectionKey>(e =>
        {
            e.ToTable("data_protection_keys");
            e.Property(k => k.Id).HasColumnName("id");
            e.Property(k => k.FriendlyName).HasColumnName("friendly_name");
            e.Property(k => k.Xml).HasColumnName("xml");
        });
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
            e.Property(s => s.AuditHash).HasColumnName("audit_hash");
            e.Property(s => s.StateSignature).HasColumnName("state_signature");
            e.Property(s => s.ProfileVersion).HasColumnName("profile_version");
            e.Property(s => s.SavedAt).HasColumnName("saved_at");
        });

        modelBuilder.Entity<EngineLeadershipRow>(e =>
        {
            e.ToTable("engine_leadership", t => t.HasCheckConstraint("ck_engine_leadership_single_row", "id = 1"));
            e.HasKey(l => l.Id);
            e.Property(l => l.Id).HasColumnName("id").ValueGeneratedNever();
            e.Property(l => l.Epoch).HasColumnName("epoch");
            e.Property(l => l.NodeId).HasColumnName("node_id");
            e.Property(l => l.Since).HasColumnName("since");
        });
        modelBuilder.Entity<ReadingInboxRow>(e =>
        {
            e.ToTable("reading_inbox");
            e.HasKey(r => r.Id);
            e.Property(r => r.Id).HasColumnName("id");
            e.Property(r => r.ReceivedAt).HasColumnName("received_at");
            e.Property(r => r.Source).HasColumnName("source");
            e.Property(r => r.NodeId).HasColumnName("node_id");
            e.Property(r => r.Body).HasColumnName("body");
            e.Property(r => r.Accepted).HasColumnName("accepted");
            e.Property(r => r.Rejected).HasColumnName("rejected");
            e.Property(r => r.Attempts).HasColumnName("attempts").HasDefaultValue(0);
            e.Property(r => r.LastError).HasColumnName("last_error");
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

        modelBuilder.Entity<DisplayTokenRow>(e =>
        {
            e.ToTable("display_tokens");
            e.HasKey(t => t.Id);
            e.Property(t => t.Id).HasColumnName("id");
            e.Property(t => t.Name).HasColumnName("name");
            e.Property(t => t.TokenHash).HasColumnName("token_hash");
            e.Property(t => t.CreatedBy).HasColumnName("created_by");
            e.Property(t => t.CreatedAt).HasColumnName("created_at");
            e.Property(t => t.RevokedAt).HasColumnName("revoked_at");
            e.Property(t => t.LastUsedAt).HasColumnName("last_used_at");
            e.HasIndex(t => t.TokenHash).IsUnique().HasDatabaseName("ix_display_tokens_token_hash");
        });

        modelBuilder.Entity<ApiKeyRow>(e =>
        {
            e.ToTable("api_keys");
            e.HasKey(k => k.Id);
            e.Property(k => k.Id).HasColumnName("id");
            e.Property(k => k.Name).HasColumnName("name");
            e.Property(k => k.KeyHash).HasColumnName("key_hash");
            e.Property(k => k.Scopes).HasColumnName("scopes");
            e.Property(k => k.CreatedBy).HasColumnName("created_by");
            e.Property(k => k.CreatedAt).HasColumnName("created_at");
            e.Property(k => k.RevokedAt).HasColumnName("revoked_at");
            e.Property(k => k.LastUsedAt).HasColumnName("last_used_at");
            e.HasIndex(k => k.KeyHash).IsUnique().HasDatabaseName("ix_api_keys_key_hash");
        });

        if (Database.IsNpgsql())
        {
            UseByteOrderForTimes(modelBuilder);
        }
    }

    /// <summary>
    /// Times are stored as fixed-width UTC text (<see cref="UtcTextConverter"/>) and compared as text; on PostgreSQL
    /// their columns use the "C" collation so text order is byte order (and range scans use the index) whatever the
    /// database's default collation is. SQLite compares bytes already.
    /// </summary>
    private static void UseByteOrderForTimes(ModelBuilder modelBuilder)
    {
        foreach (var entity in modelBuilder.Model.GetEntityTypes())
        {
            foreach (var property in entity.GetProperties())
            {
                if (property.ClrType == typeof(DateTimeOffset) || property.ClrType == typeof(DateTimeOffset?))
                {
                    property.SetCollation("C");
                }
            }
        }
        // the audit time is kept as its exact canonical text (a string property), compared the same way
        modelBuilder.Entity<AuditEntryRow>().Property(a => a.Time).UseCollation("C");
    }

    /// <summary>Identity's tables and columns in the database's snake_case style (users, roles, user_roles, ...).</summary>
    private static void MapIdentityTables(ModelBuilder modelBuilder)
    {
        var tables = new Dictionary<Type, string>
        {
            [typeof(OpsLvpUser)] = "users",
            [typeof(IdentityRole)] = "roles",
            [typeof(IdentityUserRole<string>)] = "user_roles",
            [typeof(IdentityUserClaim<string>)] = "user_claims",
            [typeof(IdentityRoleClaim<string>)] = "role_claims",
            [typeof(IdentityUserLogin<string>)] = "user_logins",
            [typeof(IdentityUserToken<string>)] = "user_tokens",
        };
        foreach (var (type, table) in tables)
        {
            var entity = modelBuilder.Entity(type);
            entity.ToTable(table);
            foreach (var property in entity.Metadata.GetProperties())
            {
                entity.Property(property.Name).HasColumnName(SnakeCase(property.Name));
            }
        }
    }

    private static string SnakeCase(string name)
    {
        var text = new StringBuilder(name.Length + 8);
        for (var i = 0; i < name.Length; i++)
        {
            if (char.IsUpper(name[i]) && i > 0)
            {
                text.Append('_');
            }
            text.Append(char.ToLowerInvariant(name[i]));
        }
        return text.ToString();
    }
}
