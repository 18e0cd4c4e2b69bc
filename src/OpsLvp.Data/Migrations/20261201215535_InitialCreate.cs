using Microsoft.EntityFrameworkCore.Migrations;

#nullable disable

namespace OpsLvp.Data.Migrations
{
    /// <inheritdoc />
    public partial class InitialCreate : Migration
    {
        /// <inheritdoc />
        protected override void Up(MigrationBuilder migrationBuilder)
        {
            migrationBuilder.CreateTable(
                name: "audit_entries",
                columns: table => new
                {
                    sequence = table.Column<long>(type: "INTEGER", nullable: false),
                    time = table.Column<string>(type: "TEXT", nullable: false),
                    actor = table.Column<string>(type: "TEXT", nullable: false),
                    kind = table.Column<string>(type: "TEXT", nullable: false),
                    payload_json = table.Column<string>(type: "TEXT", nullable: false),
                    previous_hash = table.Column<string>(type: "TEXT", nullable: false),
                    hash = table.Column<string>(type: "TEXT", nullable: false)
                },
                constraints: table =>
                {
                    table.PrimaryKey("PK_audit_entries", x => x.sequence);
                    table.CheckConstraint("ck_audit_entries_sequence", "sequence >= 1");
                });

            migrationBuilder.CreateTable(
                name: "engine_state",
                columns: table => new
                {
                    id = table.Column<int>(type: "INTEGER", nullable: false),
                    state_json = table.Column<string>(type: "TEXT", nullable: false),
                    audit_sequence = table.Column<long>(type: "INTEGER", nullable: false),
                    profile_version = table.Column<string>(type: "TEXT", nullable: false),
                    saved_at = table.Column<string>(type: "TEXT", nullable: false)
                },
                constraints: table =>
                {
                    table.PrimaryKey("PK_engine_state", x => x.id);
                    table.CheckConstraint("ck_engine_state_single_row", "id = 1");
                });

            migrationBuilder.CreateTable(
                name: "feed_health",
                columns: table => new
                {
                    feed = table.Column<string>(type: "TEXT", nullable: false),
                    last_good_at = table.Column<string>(type: "TEXT", nullable: true),
                    consecutive_failures = table.Column<int>(type: "INTEGER", nullable: false),
                    last_error = table.Column<string>(type: "TEXT", nullable: true),
                    last_error_at = table.Column<string>(type: "TEXT", nullable: true)
                },
                constraints: table =>
                {
                    table.PrimaryKey("PK_feed_health", x => x.feed);
                });

            migrationBuilder.CreateTable(
                name: "readings",
                columns: table => new
                {
                    id = table.Column<long>(type: "INTEGER", nullable: false)
                        .Annotation("Sqlite:Autoincrement", true),
                    time = table.Column<string>(type: "TEXT", nullable: true),
                    received_at = table.Column<string>(type: "TEXT", nullable: false),
                    source = table.Column<string>(type: "TEXT", nullable: false),
                    sensor = table.Column<string>(type: "TEXT", nullable: false),
                    kind = table.Column<string>(type: "TEXT", nullable: false),
                    value = table.Column<double>(type: "REAL", nullable: true),
                    status = table.Column<string>(type: "TEXT", nullable: true),
                    accepted = table.Column<bool>(type: "INTEGER", nullable: false),
                    reject_reason = table.Column<string>(type: "TEXT", nullable: true),
                    reject_detail = table.Column<string>(type: "TEXT", nullable: true)
                },
                constraints: table =>
                {
                    table.PrimaryKey("PK_readings", x => x.id);
                });

            migrationBuilder.CreateIndex(
                name: "ix_audit_entries_time",
                table: "audit_entries",
                column: "time");

            migrationBuilder.CreateIndex(
                name: "ix_readings_received_at",
                table: "readings",
                column: "received_at");

            migrationBuilder.CreateIndex(
                name: "ix_readings_sensor_kind_time",
                table: "readings",
                columns: new[] { "sensor", "kind", "time" });

            // Added by hand: the audit log is append-only (docs/engine.md R12). SQLite syntax; another provider needs its own.
            migrationBuilder.Sql("CREATE TRIGGER audit_entries_no_update BEFORE UPDATE ON audit_entries BEGIN SELECT RAISE(ABORT, 'audit_entries is append-only'); END;");
            migrationBuilder.Sql("CREATE TRIGGER audit_entries_no_delete BEFORE DELETE ON audit_entries BEGIN SELECT RAISE(ABORT, 'audit_entries is append-only'); END;");
        }

        /// <inheritdoc />
        protected override void Down(MigrationBuilder migrationBuilder)
        {
            migrationBuilder.Sql("DROP TRIGGER IF EXISTS audit_entries_no_update;");
            migrationBuilder.Sql("DROP TRIGGER IF EXISTS audit_entries_no_delete;");

            migrationBuilder.DropTable(
                name: "audit_entries");

            migrationBuilder.DropTable(
                name: "engine_state");

            migrationBuilder.DropTable(
                name: "feed_health");

            migrationBuilder.DropTable(
                name: "readings");
        }
    }
}
