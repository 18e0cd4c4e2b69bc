using Microsoft.EntityFrameworkCore.Migrations;

#nullable disable

namespace OpsLvp.Data.Migrations
{
    /// <inheritdoc />
    public partial class TamperEvidence : Migration
    {
        /// <inheritdoc />
        protected override void Up(MigrationBuilder migrationBuilder)
        {
            migrationBuilder.AddColumn<string>(
                name: "audit_hash",
                table: "engine_state",
                type: "TEXT",
                nullable: true);
        }

        /// <inheritdoc />
        protected override void Down(MigrationBuilder migrationBuilder)
        {
            migrationBuilder.DropColumn(
                name: "audit_hash",
                table: "engine_state");
        }
    }
}
