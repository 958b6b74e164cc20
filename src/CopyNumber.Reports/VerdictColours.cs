using ScottPlot;

namespace CopyNumber.Reports;

/// <summary>
/// The verdict map's colours, ours: each verdict differs from the others in lightness as well as hue (pale
/// for adequate, mid for noise-dominated, dark for the rest, each dark one of a different hue), so the map
/// reads in greyscale and under any colour-vision deficiency, which changes hue and leaves lightness; every
/// cell also carries its verdict's letter, so no meaning rests on colour alone.
/// </summary>
internal static class VerdictColours
{
    /// <summary>Colour, letter and label per map category, in drawing priority (the first that applies colours the cell).</summary>
    public static readonly IReadOnlyList<(string Column, string Letter, string Label, Color Colour)> Categories =
    [
        ("too_few_replicates", "?", "too few replicates", Color.FromHex("#BDBDBD")),
        ("multimodal", "B", "multimodal", Color.FromHex("#5B2A6E")),
        ("extinction_prone", "X", "extinction-prone", Color.FromHex("#3B3B3B")),
        ("mean_shifted", "M", "mean shifted", Color.FromHex("#1F4E79")),
        ("noise_dominated", "N", "noise-dominated", Color.FromHex("#D9952B")),
        ("cycle_lost_to_noise", "L", "cycle lost to noise", Color.FromHex("#8C510A")),
        ("cycles_with_rate_equations", "C", "cycles with the rate equations", Color.FromHex("#6BAED6")),
        ("noise_driven_ringing", "R", "noise-driven ringing", Color.FromHex("#01665E")),
        ("adequate", "A", "adequate", Color.FromHex("#E3F1E6")),
    ];

    /// <summary>The boundary where the rate equations become adequate.</summary>
    public static readonly Color Boundary = Color.FromHex("#C0392B");

    /// <summary>The outline of the rate equations' bistable region.</summary>
    public static readonly Color Bistable = Color.FromHex("#111111");
}
