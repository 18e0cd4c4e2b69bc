using Microsoft.EntityFrameworkCore.Migrations;

#nullable disable

namespace OpsLvp.Data.Postgres.Migrations
{
    /// <inheritdoc />
    public partial class InboxAttempts : Migration
    {
        /// <inheritdoc />
        protected override void Up(MigrationBuilder migrationBuilder)
        {
            migrationBuilder.AddColumn<int>(
                name: "attempts",
                table: "reading_inbox",
                type: "integer",
                nullable: false,
                defaultValue: 0);

            migrationBuilder.AddColumn<string>(
                name: "last_error",
                table: "reading_inbox",
                type: "text",
                nullable: true);
        }

        /// <inheritdoc />
        protected override void Down(MigrationBuilder migrationBuilder)
        {
            migrationBuilder.DropColumn(
                name: "attempts",
                table: "reading_inbox");

            migrationBuilder.DropColumn(
                name: "last_error",
                table: "reading_inbox");
        }
    }
}
