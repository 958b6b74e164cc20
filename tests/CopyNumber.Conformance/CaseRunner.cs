using CopyNumber.Deterministic;
using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Sbml;
using CopyNumber.Stochastic;
using MathNet.Numerics.Distributions;

namespace CopyNumber.Conformance;

/// <summary>Runs one case of the SBML Test Suite: import, then the rate equations or the exact stochastic methods, then the suite's criterion.</summary>
internal sealed class CaseRunner(RunnerOptions options)
{
    public CaseOutcome Run(string folder, string kind)
    {
        var name = Path.GetFileName(folder);
        var tags = Tags(Path.Combine(folder, $"{name}-model.m"));
        CaseOutcome Outcome(string verdict, string detail) => new(name, kind, verdict, detail, tags);
        var model = new[] { "l3v2", "l3v1", "l2v4" }.Select(v => Path.Combine(folder, $"{name}-sbml-{v}.xml")).FirstOrDefault(File.Exists);
        if (model is null) return Outcome(CaseOutcome.Unsupported, "no Level 3 or Level 2 Version 4 model in the case");
        var settings = CaseSettings.Read(Path.Combine(folder, $"{name}-settings.txt"));
        var outputs = settings.Variables.Select(v => new SbmlOutput(v, settings.Concentrations.Contains(v))).ToList();
        var imported = SbmlImporter.Import(File.ReadAllText(model), Path.GetFileName(model), new SbmlImportOptions { Outputs = outputs });
        if (!imported.Succeeded) return Outcome(CaseOutcome.Unsupported, Reason(imported.Diagnostics[0].Message));
        var loaded = ModelLoader.LoadText(imported.CnetText!, Path.GetFileName(model) + " (as imported)");
        if (loaded.Model is null) return Outcome(CaseOutcome.Unsupported, "translation refused: " + Reason(loaded.Diagnostics[0].Message));
        if (settings.Start != 0 || settings.Steps <= 0) return Outcome(CaseOutcome.Unsupported, $"the grid starts at {settings.Start}, not 0");
        var grid = new TimeGrid(settings.Duration, settings.Duration / settings.Steps);
        try
        {
            return kind == "semantic"
                ? Semantic(Outcome, loaded.Model.Network, grid, settings, imported.OutputColumns, ResultsTable.Read(Path.Combine(folder, $"{name}-results.csv")))
                : Stochastic(Outcome, loaded.Model.Network, grid, settings, imported.OutputColumns, ResultsTable.Read(Path.Combine(folder, $"{name}-results.csv")));
        }
        catch (CopyNumberException e) when (e.Kind == ErrorKind.BadInput)
        {
            return Outcome(CaseOutcome.Unsupported, "engine: " + Reason(e.Message));
        }
        catch (CopyNumberException e)
        {
            return Outcome(CaseOutcome.Failed, "run failed: " + Reason(e.Message));
        }
    }

    private static string Reason(string message)
    {
        var first = message.Split('\n')[0];
        var at = first.IndexOf(": error: ", StringComparison.Ordinal);
        return at >= 0 ? first[(at + 9)..] : first;
    }

    private static IReadOnlyList<string> Tags(string path)
    {
        if (!File.Exists(path)) return [];
        return File.ReadLines(path).Where(l => l.StartsWith("componentTags:") || l.StartsWith("testTags:"))
            .SelectMany(l => l.Split(':', 2)[1].Split(',', StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries)).ToList();
    }

    /// <summary>The suite's criterion for time courses: |simulated − expected| ≤ absolute + relative·|expected| at every point (README-suite.md).</summary>
    private static CaseOutcome Semantic(Func<string, string, CaseOutcome> outcome, ReactionNetwork network, TimeGrid grid, CaseSettings settings,
        IReadOnlyDictionary<SbmlOutput, string> columns, ResultsTable expected)
    {
        var solver = new SolverOptions(SolverKind.Auto, 1e-10, Math.Max(1e-300, Math.Min(1e-12, settings.Absolute * 1e-4)), 5_000_000);
        var solution = Simulate.RateEquations(network, grid, solver);
        var worst = 0.0;
        var where = "";
        foreach (var variable in settings.Variables)
        {
            var column = solution.ColumnIndex(columns[new SbmlOutput(variable, settings.Concentrations.Contains(variable))]);
            var e = expected.Column(variable);
            for (var i = 0; i < grid.Count && i < expected.Rows.Count; i++)
            {
                var want = expected.Rows[i][e];
                var got = solution[i, column];
                var allowed = settings.Absolute + settings.Relative * Math.Abs(want);
                var ratio = double.IsNaN(want) && double.IsNaN(got) || want == got ? 0 : Math.Abs(got - want) / allowed;
                if (!(ratio <= worst))
                {
                    worst = double.IsNaN(ratio) ? double.PositiveInfinity : ratio;
                    where = $"{variable} at t = {grid[i]}: {got:G8} against {want:G8}";
                }
            }
        }
        return worst <= 1
            ? outcome(CaseOutcome.Passed, $"worst deviation {worst:G3} of the tolerance")
            : outcome(CaseOutcome.Failed, $"worst deviation {worst:0.###} times the tolerance ({where})");
    }

    /// <summary>
    /// The Discrete Stochastic Models Test Suite's criteria (Evans, Gillespie &amp; Wilkinson 2008):
    /// Z = √n (mean − μ)/σ and Y = √(n/2)(s²/σ² − 1) within the case's ranges, widened for the number of
    /// tests in the case (Bonferroni: the two-sided normal quantile at 0.001 / (2m) when that is wider), for
    /// every exact method.
    /// </summary>
    /// <summary>The sample kurtosis μ₄/σ⁴ of a count's histogram.</summary>
    private static double Kurtosis(CountHistogram histogram, double mean)
    {
        double m2 = 0, m4 = 0, total = 0;
        foreach (var f in histogram)
        {
            var d = f.Value - mean;
            m2 += f.Frequency * d * d;
            m4 += f.Frequency * d * d * d * d;
            total += f.Frequency;
        }
        m2 /= total;
        m4 /= total;
        return m2 > 0 ? m4 / (m2 * m2) : 3;
    }

    private CaseOutcome Stochastic(Func<string, string, CaseOutcome> outcome, ReactionNetwork network, TimeGrid grid, CaseSettings settings,
        IReadOnlyDictionary<SbmlOutput, string> columns, ResultsTable expected)
    {
        var tests = 2 * settings.Variables.Count * grid.Count;
        var critical = Normal.InvCDF(0, 1, 1 - 0.001 / (2 * tests));
        var zLimit = (Math.Min(settings.MeanRange.Low, -critical), Math.Max(settings.MeanRange.High, critical));
        var yLimit = (Math.Min(settings.SdRange.Low, -critical), Math.Max(settings.SdRange.High, critical));
        var worst = 0.0;
        var where = "";
        foreach (var method in options.Methods)
        {
            var result = Simulate.Ensemble(network, new EnsembleOptions
            {
                Grid = grid, Replicates = options.Replicates, Seed = options.Seed, Method = method, Threads = options.Threads,
            });
            var n = (double)result.ReplicatesFinished;
            foreach (var variable in settings.Variables)
            {
                var columnName = columns[new SbmlOutput(variable, false)];
                var q = result.Quantities.First(x => x.Name == columnName);
                var meanColumn = expected.Column(variable + "-mean");
                var sdColumn = expected.Column(variable + "-sd");
                for (var i = 0; i < grid.Count && i < expected.Rows.Count; i++)
                {
                    double mean, variance, kurtosis = 3;
                    if (q.IsCount)
                    {
                        var histogram = result.Histogram(i, result.CountQuantities.ToList().IndexOf(q));
                        var summary = DistributionSummary.From(histogram);
                        (mean, variance) = (summary.Mean, summary.Variance);
                        kurtosis = Kurtosis(histogram, summary.Mean);
                    }
                    else
                    {
                        var m = result.Moments(i, result.RealQuantities.ToList().IndexOf(q));
                        (mean, variance) = (m.Mean, m.Variance);
                    }
                    var mu = expected.Rows[i][meanColumn];
                    var sigma = expected.Rows[i][sdColumn];
                    if (sigma == 0)
                    {
                        // A deterministic point: every replicate must sit on the mean.
                        var off = Math.Abs(mean - mu) + Math.Sqrt(Math.Max(0, variance));
                        if (off > 1e-9 * Math.Max(1, Math.Abs(mu)) && off > worst) { worst = double.PositiveInfinity; where = $"{method} {variable} at t = {grid[i]}: mean {mean} sd {Math.Sqrt(variance)} where the suite has {mu} exactly"; }
                        continue;
                    }
                    var z = Math.Sqrt(n) * (mean - mu) / sigma;
                    // The suite's Y assumes the normal kurtosis 3, under which s² has variance 2σ⁴/n. For a count
                    // with heavy tails (birth–death near extinction) that is far too small: s² has variance
                    // (μ₄ − σ⁴)/n (common practice, the delta method), so Y is scaled by √(2/(κ − 1)), κ the sample kurtosis.
                    var y = Math.Sqrt(n / 2) * (variance / (sigma * sigma) - 1) * Math.Sqrt(2 / Math.Max(2, kurtosis - 1));
                    var zScore = z < 0 ? z / zLimit.Item1 : z / zLimit.Item2;   // 1 at the edge of the range
                    var yScore = y < 0 ? y / yLimit.Item1 : y / yLimit.Item2;
                    var score = Math.Max(zScore, yScore);
                    if (!(score <= worst))
                    {
                        worst = double.IsNaN(score) ? double.PositiveInfinity : score;
                        where = $"{method} {variable} at t = {grid[i]}: Z = {z:0.00}, Y = {y:0.00}";
                    }
                }
            }
        }
        var limits = $"|Z| ≤ {zLimit.Item2:0.00}, |Y| ≤ {yLimit.Item2:0.00}, n = {options.Replicates}, {string.Join("/", options.Methods)}";
        return worst <= 1
            ? outcome(CaseOutcome.Passed, $"worst {worst:0.00} of the range ({limits})")
            : outcome(CaseOutcome.Failed, $"{where} ({limits})");
    }
}

/// <summary>Settings of a conformance run.</summary>
internal sealed record RunnerOptions(long Replicates, ulong Seed, IReadOnlyList<SimulationMethod> Methods, int Threads);
