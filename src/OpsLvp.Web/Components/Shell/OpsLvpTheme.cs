using MudBlazor;

namespace OpsLvp.Web.Components.Shell;

/// <summary>
/// OpsLvp's own dark theme for an operations room at night: near-black blue background, high-contrast text,
/// large type readable from across the room. Colours are our own choice.
/// </summary>
public static class OpsLvpTheme
{
    private static readonly string[] s_fontStack = ["Inter", "Segoe UI", "Roboto", "Helvetica Neue", "Arial", "sans-serif"];

    public static MudTheme Theme { get; } = new()
    {
        PaletteDark = new PaletteDark
        {
            Black = "#05080C",
            Background = "#0A0F16",
            BackgroundGray = "#101722",
            Surface = "#121A26",
            AppbarBackground = "#0E1520",
            AppbarText = "#F3F6FA",
            DrawerBackground = "#0E1520",
            DrawerText = "#E6ECF2",
            Primary = "#6CC7F0",
            Secondary = "#F2A541",
            Tertiary = "#B79CF2",
            Info = "#7FB2FF",
            Success = "#3FD68A",
            Warning = "#FFC23D",
            Error = "#FF5D5D",
            // Dark text on the bright accent colours: white on them fails WCAG AA contrast (axe color-contrast).
            PrimaryContrastText = "#0A0F16",
            SecondaryContrastText = "#0A0F16",
            TertiaryContrastText = "#0A0F16",
            InfoContrastText = "#0A0F16",
            SuccessContrastText = "#0A0F16",
            WarningContrastText = "#0A0F16",
            ErrorContrastText = "#0A0F16",
            TextPrimary = "#F3F6FA",
            TextSecondary = "#B9C4D0",
            TextDisabled = "#6B7785",
            ActionDefault = "#C9D3DD",
            LinesDefault = "#2A3646",
            Divider = "#2A3646",
            TableLines = "#2A3646",
        },
        Typography = new Typography
        {
            Default = new DefaultTypography { FontFamily = s_fontStack, FontSize = "1.125rem", LineHeight = "1.5" },
            H1 = new H1Typography { FontFamily = s_fontStack, FontSize = "3rem", FontWeight = "700" },
            H2 = new H2Typography { FontFamily = s_fontStack, FontSize = "2.5rem", FontWeight = "700" },
            H3 = new H3Typography { FontFamily = s_fontStack, FontSize = "2rem", FontWeight = "600" },
            H4 = new H4Typography { FontFamily = s_fontStack, FontSize = "1.75rem", FontWeight = "600" },
            H5 = new H5Typography { FontFamily = s_fontStack, FontSize = "1.5rem", FontWeight = "600" },
            H6 = new H6Typography { FontFamily = s_fontStack, FontSize = "1.25rem", FontWeight = "600" },
            Body1 = new Body1Typography { FontFamily = s_fontStack, FontSize = "1.125rem" },
            Body2 = new Body2Typography { FontFamily = s_fontStack, FontSize = "1rem" },
            Button = new ButtonTypography { FontFamily = s_fontStack, FontSize = "1.05rem", FontWeight = "600", TextTransform = "none" },
        },
        LayoutProperties = new LayoutProperties { DefaultBorderRadius = "6px", AppbarHeight = "64px" },
    };
}
