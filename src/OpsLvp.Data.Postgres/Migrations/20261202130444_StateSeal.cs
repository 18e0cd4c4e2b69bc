using Microsoft.EntityFrameworkCore.Migrations;

#nullable disable

namespace OpsLvp.Data.Postgres.Migrations
{
    /// <inheritdoc />
    public partial class StateSeal : Migration
    {
        /// <inheritdoc />
        protected override void Up(MigrationBuilder migrationBuilder)
        {
            migrationBuilder.AddColumn<string>(
                name: "state_signature",
                table: "engine_state",
                type: "text",
                nullable: true);
        }

        /// <inheritdoc />
        protected override void Down(MigrationBuilder migrationBuilder)
        {
            migrationBuilder.DropColumn(
                name: "state_signature",
                table: "engine_state");
        }
    }
}
