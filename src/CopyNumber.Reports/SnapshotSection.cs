using System.Globalization;
using CopyNumber.Ensembles;
using CopyNumber.Storage;

namespace CopyNumber.Reports;

/// <summary>
/// The report's population snapshot (<c>simulate --view population</c>): per species the culture's and the
/// lineage's mean, variance, CV² and Fano factor with their standard errors and the difference, and a figure
/// of both laws (docs/methods.md "Growth and division").
/// </summary>
internal static class SnapshotSection
{
    /// <summary>The section, or null when the run has no snapshot.</summary>
    public static ReportSection? For(string folder)
    {
        if (SnapshotTable.Read(folder) is not { } snapshot) return null;
        var rows = new List<IReadOnlyList<string>>();
        foreach (var m in snapshot.Moments)
        {
            rows.Add([m.Species, m.View == "lineage" ? "lineage (time average)" : "population (snapshot)", Pm(m.Mean), Pm(m.Variance), Pm(m.Cv2), Pm(m.Fano)]);
            if (m.View == "population")
                rows.Add([m.Species, "population − lineage", Pm(m.DifferenceMean), Pm(m.DifferenceVariance), "", ""]);
        }
        var laws = snapshot.Moments.Select(m => m.Species).Distinct().Select(species =>
        {
            var (lineage, population) = (snapshot.Laws.GetValueOrDefault((species, "lineage")), snapshot.Laws.GetValueOrDefault((species, "population")));
            double MeanOf(string view) => snapshot.Moments.First(m => m.Species == species && m.View == view).Mean.Value;
            return new SnapshotFigure.Laws(species, lineage.Counts ?? [], lineage.Probabilities ?? [], MeanOf("lineage"),
                population.Counts ?? [], population.Probabilities ?? [], MeanOf("population"));
        }).ToArray();
        var figure = new ReportFigure("population-snapshot.png",
            "Each species' law in a snapshot of a growing culture (what flow cytometry sees) and along one lineage averaged over time (what a mother machine sees); dashed: the means.",
            SnapshotFigure.Render(laws, 1200, 420 * Math.Max(1, (laws.Length + 2) / 3)));
        var inv = CultureInfo.InvariantCulture;
        var drifting = snapshot.Moments.Where(m => m.View == "population" && Math.Abs(m.Settling.Value) > SnapshotResult.SettlingLimit * m.Settling.StandardError)
            .Select(m => $"{m.Species} ({Pm(m.Settling)})").ToArray();
        var settling = drifting.Length == 0
            ? "No species' population mean differs between the earlier and the later half of the sampled cycles beyond "
              + string.Create(inv, $"{SnapshotResult.SettlingLimit:G} standard errors (the lineages had settled after the burn-in, as far as this check sees).")
            : $"Caution: the population mean still drifts between the earlier and the later half of the sampled cycles for {string.Join(", ", drifting)} "
              + string.Create(inv, $"(later minus earlier half): the lineages had not settled after the burn-in of {snapshot.BurnIn} divisions, so these values are biased towards the start; rerun with a larger --burn-in and --until.");
        return new ReportSection(
            "Population snapshot",
            [
                string.Create(inv, $"A culture in balanced exponential growth (growth rate Λ = {snapshot.GrowthRate:G4} per time unit) holds more young, small cells than one lineage passes through: ")
                + "its snapshot weighs every age by the culture's age density, and for a random cycle length also follows the ancestors' shorter cycles (docs/methods.md, Growth and division). "
                + string.Create(inv, $"Estimated from {snapshot.Replicates} independent lineages, each sampled at {snapshot.AgesPerCycle} random ages of each of {snapshot.Cycles} cycles after a burn-in of {snapshot.BurnIn} divisions; ")
                + "standard errors from the spread between lineages (snapshot.parquet, snapshot-moments.parquet).",
                settling,
            ],
            [new ReportTable(["species", "view", "mean", "variance", "CV²", "Fano factor"], rows)],
            [figure]);
    }

    private static string Pm(Estimate e) => string.Create(CultureInfo.InvariantCulture, $"{e.Value:G5} ± {e.StandardError:G2}");
}
