using ScottPlot;

namespace CopyNumber.Reports;

/// <summary>
/// Every colour the figures use, in one place. The hues are the eight of the Okabe–Ito palette, chosen
/// to stay distinct under the common forms of colour-vision deficiency (Okabe M. &amp; Ito K. 2008,
/// "Color Universal Design (CUD): how to make figures and presentations that are friendly to colorblind
/// people", J*Fly, jfly.uni-koeln.de/color; also Wong B. 2011, Nature Methods 8:441). The neutral greys
/// are ours. Meaning is never carried by colour alone: line pattern, fill or marker shape differ too.
/// </summary>
internal static class Palette
{
    public static readonly Color Black = Color.FromHex("#000000");
    public static readonly Color Orange = Color.FromHex("#E69F00");
    public static readonly Color SkyBlue = Color.FromHex("#56B4E9");
    public static readonly Color BluishGreen = Color.FromHex("#009E73");
    public static readonly Color Yellow = Color.FromHex("#F0E442");
    public static readonly Color Blue = Color.FromHex("#0072B2");
    public static readonly Color Vermillion = Color.FromHex("#D55E00");
    public static readonly Color ReddishPurple = Color.FromHex("#CC79A7");

    /// <summary>Individual sample paths: present but recessive.</summary>
    public static readonly Color SamplePath = Color.FromHex("#9A9A9A").WithAlpha(0.55);
    public static readonly Color Grid = Color.FromHex("#E4E4E4");
    public static readonly Color Ink = Color.FromHex("#222222");
    public static readonly Color Note = Color.FromHex("#6B6B6B");

    /// <summary>Ensemble (simulation) results: blue family.</summary>
    public static readonly Color EnsembleMean = Blue;
    public static readonly Color EnsembleBand = SkyBlue.WithAlpha(0.45);

    /// <summary>Deterministic and linear-noise results: vermillion family.</summary>
    public static readonly Color RateEquation = Vermillion;

    /// <summary>Schedule changes on a time axis: dotted, in a hue no time figure uses for data.</summary>
    public static readonly Color Schedule = ReddishPurple;

    /// <summary>Verdict thresholds: dashed, neutral.</summary>
    public static readonly Color Threshold = Black;

    /// <summary>Series colours in order of use; yellow is left out, it is too pale on white for lines.</summary>
    public static readonly Color[] Series = [Blue, Vermillion, BluishGreen, ReddishPurple, Orange, SkyBlue, Black];

    /// <summary>Marker shapes paired with <see cref="Series"/>, so series differ without colour.</summary>
    public static readonly MarkerShape[] SeriesMarkers =
    [
        MarkerShape.FilledCircle, MarkerShape.FilledSquare, MarkerShape.FilledTriangleUp,
        MarkerShape.FilledDiamond, MarkerShape.OpenCircle, MarkerShape.OpenSquare, MarkerShape.FilledTriangleDown,
    ];
}
