using Microsoft.EntityFrameworkCore.Migrations;

#nullable disable

namespace OpsLvp.Data.Postgres.Migrations
{
    /// <inheritdoc />
    public partial class EngineLeadership : Migration
    {
        /// <inheritdoc />
        protected override void Up(MigrationBuilder migrationBuilder)
        {
            migrationBuilder.CreateTable(
                name: "engine_leadership",
                columns: table => new
                {
                    id = table.Column<int>(type: "integer", nullable: false),
                    epoch = table.Column<long>(type: "bigint", nullable: false),
                    node_id = table.Column<string>(type: "text", nullable: false),
                    since = table.Column<string>(type: "text", nullable: false, collation: "C")
                },
                constraints: table =>
                {
                    table.PrimaryKey("PK_engine_leadership", x => x.id);
                    table.CheckConstraint("ck_engine_leadership_single_row", "id = 1");
                });
        }

        /// <inheritdoc />
        protected override void Down(MigrationBuilder migrationBuilder)
        {
            migrationBuilder.DropTable(
                name: "engine_leadership");
        }
    }
}
