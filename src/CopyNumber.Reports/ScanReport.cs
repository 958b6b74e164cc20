using System.Globalization;
using CopyNumber.Analysis;
using CopyNumber.Storage;

namespace CopyNumber.Reports;

/// <summary>
/// The report of a scan: for one varied name, curves of each measure against it; for two, a verdict map per
/// quantity with the adequacy boundary and the rate equations' bistable region; for more, the table only
/// (with a note). Always the table of every point and quantity, and how the error rate is held over the map.
/// </summary>
public static class ScanReport
{
    /// <summary>Builds the report.</summary>
    /// <param name="model">The model's name.</param>
    /// <param name="axes">The varied names in axis order, with whether each was given as a logarithmic range.</param>
    /// <param name="cells">scan.parquet's rows.</param>
    /// <param name="thresholds">The map's thresholds (α over the whole map).</param>
    /// <param name="points">The map's points.</param>
    public static Report Build(string model, IReadOnlyList<(string Name, bool Log)> axes, IReadOnlyList<ScanCell> cells, ContrastThresholds thresholds, int points)
    {
        ArgumentNullException.ThrowIfNull(axes);
        ArgumentNullException.ThrowIfNull(cells);
        ArgumentNullException.ThrowIfNull(thresholds);
        var quantities = cells.Select(c => c.Quantity).Distinct().ToArray();
        var figures = new List<ReportFigure>();
        var paragraphs = new List<string>
        {
            $"{points} points, one ensemble and one contrast each (the run folders point-NNNN). Every point uses the same seed, so replicate r draws the same random numbers at every point (common random numbers).",
            $"Each verdict is a test of level α = {Format(thresholds.FalseAlarmRate)} per quantity over the whole map: at each point it is run at α/{points} = {Format(thresholds.FalseAlarmRate / points)} (Bonferroni), so a false verdict of a kind anywhere on the map has a chance of at most α.",
            "Stable steady states: of the rate equations with the point's parameters, found from several starting points and confirmed by the Jacobian's eigenvalues; two or more mean deterministic bistability, whereas several modes at one steady state are noise-induced.",
        };
        if (axes.Count == 1)
        {
            var (name, log) = axes[0];
            List<(string, double[], double[], double[]?)> Series(Func<ScanCell, double> y, Func<ScanCell, double>? half) =>
                quantities.Select(q =>
                {
                    var rows = cells.Where(c => c.Quantity == q).OrderBy(c => c.Values[0]).ToArray();
                    return (q, rows.Select(c => c.Values[0]).ToArray(), rows.Select(y).ToArray(), half is null ? null : rows.Select(half).ToArray());
                }).ToList();
            var shift = thresholds.RelativeDeviation;
            figures.Add(new("scan-deviation.png", $"Relative deviation of the mean from the rate equations at the final time against {name}, with its confidence band (z·SE) and the ±{Percent(shift)} threshold.",
                ScanFigures.Curves("mean against rate equations", name, log, "(mean − RE) / RE at the final time", Series(c => c.FinalRelativeDeviation, c => c.FinalRelativeDeviationError), [-shift, shift])));
            figures.Add(new("scan-cv.png", $"Coefficient of variation at the final time against {name}; threshold {Format(thresholds.CoefficientOfVariation)}.",
                ScanFigures.Curves("noise", name, log, "CV at the final time", Series(c => c.CoefficientOfVariation, null), [thresholds.CoefficientOfVariation])));
            figures.Add(new("scan-lna.png", $"Ensemble variance over the linear noise approximation's at the final time against {name}; 1 where the LNA holds.",
                ScanFigures.Curves("variance against LNA", name, log, "variance / LNA variance", Series(c => c.LnaRatio, null), [1])));
            figures.Add(new("scan-zero.png", $"P(0) at the final time against {name}; threshold {Format(thresholds.ExtinctionProbability)}.",
                ScanFigures.Curves("extinction", name, log, "P(count = 0) at the final time", Series(c => c.ZeroFraction, null), [thresholds.ExtinctionProbability])));
            figures.Add(new("scan-modes.png", $"Modes of the ensemble at the final time and stable steady states of the rate equations against {name}.",
                ScanFigures.Curves("modes and steady states", name, log, "count",
                    [.. Series(c => c.Modes, null).Select(s => (s.Item1 + " modes", s.Item2, s.Item3, s.Item4)),
                     (("stable steady states"), cells.Where(c => c.Quantity == quantities[0]).OrderBy(c => c.Values[0]).Select(c => c.Values[0]).ToArray(),
                      cells.Where(c => c.Quantity == quantities[0]).OrderBy(c => c.Values[0]).Select(c => (double)c.StableSteadyStates).ToArray(), null)], [1])));
        }
        else if (axes.Count == 2)
        {
            var distinct = cells.Select(c => (c.Values[0], c.Values[1])).Distinct().Count();
            var isGrid = distinct == cells.Select(c => c.Values[0]).Distinct().Count() * cells.Select(c => c.Values[1]).Distinct().Count();
            if (!isGrid) paragraphs.Add("The points are not a full grid (a Latin hypercube): the map shows each point, without the adequacy boundary, which needs neighbours on a grid; a point where the rate equations are bistable is outlined dashed.");
            foreach (var q in quantities)
                figures.Add(new($"scan-map-{Safe(q)}.png",
                    $"Verdicts for {q} over {axes[0].Name} and {axes[1].Name}: A adequate, M mean shifted, N noise-dominated, B multimodal, X extinction-prone (the first that applies, in the order B, X, M, N). " +
                    "Solid red: where the rate equations become adequate; dashed black: around the points where the rate equations have two or more stable steady states.",
                    ScanFigures.VerdictMap(q, axes[0], axes[1], cells.Where(c => c.Quantity == q).ToArray(), isGrid)));
        }
        else
        {
            paragraphs.Add($"{axes.Count} varied names: no figure is drawn (a map shows two); the table holds every point.");
        }
        var header = new List<string> { "point" };
        header.AddRange(axes.Select(a => a.Name));
        header.AddRange(["quantity", "verdicts", "largest resolved deviation", "final relative deviation", "CV", "var/LNA", "modes", "P(0)", "stable steady states"]);
        var rows = cells.Select(c =>
        {
            var row = new List<string> { c.Point.ToString(CultureInfo.InvariantCulture) };
            row.AddRange(c.Values.Select(Format));
            row.AddRange([c.Quantity, c.Verdicts,
                double.IsNaN(c.LargestDeviation) ? "none resolved" : $"{Format(c.LargestDeviation)} ± {Format(c.LargestDeviationError)}",
                double.IsNaN(c.FinalRelativeDeviation) ? "-" : $"{Percent(c.FinalRelativeDeviation)} ± {Percent(c.FinalRelativeDeviationError)}",
                Format(c.CoefficientOfVariation), Format(c.LnaRatio), c.Modes.ToString(CultureInfo.InvariantCulture), Format(c.ZeroFraction),
                c.StableSteadyStates < 0 ? "-" : $"{c.StableSteadyStates} ({c.SteadyStatesText})"]);
            return (IReadOnlyList<string>)row;
        }).ToList();
        return new Report($"CopyNumber scan: {model}", [Contrast.Caution],
            [new ReportSection("Where the rate equations hold", paragraphs, [new ReportTable(header, rows)], figures)]);
    }

    private static string Safe(string name) => new(name.Select(ch => char.IsLetterOrDigit(ch) ? ch : '_').ToArray());

    private static string Format(double value) => double.IsNaN(value) ? "-" : value.ToString("G4", CultureInfo.InvariantCulture);

    private static string Percent(double fraction) => double.IsNaN(fraction) ? "-" : (fraction * 100).ToString("0.##", CultureInfo.InvariantCulture) + "%";
}
