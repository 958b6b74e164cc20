using System.Globalization;
using CopyNumber.Analysis.Verdicts;

namespace CopyNumber.Reports;

/// <summary>
/// The report's answer to "how often does it switch, and how long does it stay?": for each species whose modes
/// the run followed at its events (<c>--switching</c> or cores from the rate equations' stable steady states), the
/// switches per replicate and the mean residence time in each mode with their standard errors
/// (<c>switching.parquet</c>, Ensembles/ModeSwitching); for a multimodal quantity not followed, how to ask for it.
/// This section only shows them.
/// </summary>
internal static class SwitchingSection
{
    /// <summary>The section, or null when the run followed no modes and no quantity calls for it.</summary>
    public static ReportSection? For(Runs.RunContrastResult contrast, string timeUnit)
    {
        var switching = contrast.ModeSwitching;
        if (switching.Count == 0 && contrast.SwitchingHints.Count == 0) return null;
        var unit = timeUnit == "time" ? null : timeUnit;
        var paragraphs = new List<string>();
        var tables = new List<ReportTable>();
        if (switching.Count > 0)
        {
            var from = contrast.SwitchingSource == "steady-states"
                ? "The cores were set before the run from the rate equations' stable steady states (a quarter of the way from each state towards the other)."
                : "The cores were given with --switching.";
            paragraphs.Add("Switching is counted at the events themselves, not between grid snapshots, so a switch and its return between two grid times are both counted. "
                + "Each species has a low core (count ≤ the low bound) and a high core (count ≥ the high bound); the counts between them belong to neither. "
                + "A switch is an entry into the core of the other mode than the one last visited, so fluctuations across the boundary that return to the same core are not switches. "
                + from);
            paragraphs.Add("A residence runs from entering a mode's core until entering the other's. The residence still running at the end of the run is censored: "
                + "its time counts, its end does not; the mean residence is the total time in the mode over the completed residences (the maximum-likelihood estimate "
                + "for exponential residences), with the standard error of this ratio over replicates. ± is one standard error.");
            paragraphs.AddRange(switching.Select(s => SwitchingSentence.Describe(s, contrast.SwitchingSource, unit) + "."));
            // Narrow enough for a page 800 pixels wide: the switches per replicate are in the sentences above.
            var rows = new List<IReadOnlyList<string>>();
            foreach (var s in switching)
                for (var m = 0; m < 2; m++)
                    rows.Add([
                        s.Species, m == 0 ? "low" : "high", m == 0 ? $"≤ {s.Low}" : $"≥ {s.High}",
                        $"{Format(s.MeanResidence(m))} ± {Format(s.ResidenceStandardError(m))}",
                        s.Mode(m).Exits.ToString(CultureInfo.InvariantCulture), s.Mode(m).Censored.ToString(CultureInfo.InvariantCulture),
                        Format(s.TimeFraction(m)),
                    ]);
            tables.Add(new ReportTable(
                ["quantity", "mode", "core", $"mean residence ({timeUnit})", "completed", "censored", "time share"], rows,
                "Residences per mode; switching.parquet holds these numbers and the switches per replicate."));
        }
        paragraphs.AddRange(contrast.SwitchingHints.Select(h => h + "."));
        return new ReportSection("Switching between modes", paragraphs, tables, []);
    }

    private static string Format(double value) => double.IsFinite(value) ? VerdictText.Number(value) : "-";
}
