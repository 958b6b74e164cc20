using CopyNumber.Analysis.Oscillation;
using CopyNumber.Analysis.Verdicts;
using CopyNumber.Deterministic;
using CopyNumber.Network;

namespace CopyNumber.Reports;

/// <summary>
/// The report's section on oscillation: what the rate equations do and, when a sample was recorded, per species the sample
/// paths beside the rate equations, the distribution of the replicates' periods and the averaged and LNA spectra.
/// </summary>
internal static class OscillationSection
{
    /// <summary>Species whose figures are drawn (the first ones, in declaration order), to keep a large network's report readable.</summary>
    public const int MaximumSpecies = 6;

    public static ReportSection? Build(RunOscillation? oscillation, ReactionNetwork network, string timeUnit)
    {
        if (oscillation is null) return null;
        var paragraphs = new List<string> { "Rate equations: " + OscillationSentence.Describe(oscillation.RateEquations) + "." };
        if (oscillation.Note is { } note) paragraphs.Add(char.ToUpperInvariant(note[0]) + note[1..] + ".");
        var figures = new List<ReportFigure>();
        if (oscillation.Sample is { } sample && oscillation.Species.Count > 0)
        {
            paragraphs.Add($"Sample: the first {sample.Replicates} replicates (seed {sample.Seed}, direct method), recorded every {sample.Step:G3} "
                + $"({OscillationSample.PointsPerPeriod} points per period) over {sample.Window:G4} after a transient of {sample.Discarded:G3}; docs/methods-analysis.md, section 7.");
            var start = sample.Discarded;
            var horizon = start + sample.Window;
            double[][]? solved = null;
            try
            {
                var solution = RateEquationSolver.Solve(network, new TimeGrid(horizon, sample.Step), new SolverOptions());
                var first = (int)Math.Round(start / sample.Step);
                solved = Enumerable.Range(0, network.Species.Count)
                    .Select(i => Enumerable.Range(first, sample.Paths[i][0].Length).Select(k => solution[Math.Min(k, solution.Grid.Count - 1), i]).ToArray()).ToArray();
            }
            catch (SolverFailureException)
            {
                paragraphs.Add("The rate equations could not be solved over the sample's times, so they are not drawn beside the paths.");
            }
            foreach (var (s, i) in oscillation.Species.Select((s, i) => (s, i)).Take(MaximumSpecies))
            {
                var safe = new string(s.Species.Select(c => char.IsAsciiLetterOrDigit(c) || c is '-' or '_' ? c : '_').ToArray());
                if (solved is not null)
                    figures.Add(new ReportFigure($"{safe}-cycle.png", $"{s.Species}: {Math.Min(CycleFigure.PathsDrawn, sample.Replicates)} sample paths beside the rate equations.",
                        CycleFigure.Render(s.Species, start, sample.Step, sample.Paths[i], solved[i], timeUnit)));
                figures.Add(new ReportFigure($"{safe}-periods.png", $"{s.Species}: the replicates' periods, the rate equations' period marked.",
                    PeriodFigure.Render(s.Species, s.Cycles.Select(c => c.Period).ToArray(), oscillation.RateEquations.Period, timeUnit)));
                figures.Add(new ReportFigure($"{safe}-spectrum.png", $"{s.Species}: averaged power spectrum of the replicates{(s.LnaPower is null ? "" : " and the LNA spectrum")}.",
                    SpectrumFigure.Render(s.Species, s.Spectrum.Frequencies, s.Spectrum.Power, s.Spectrum.PowerError, s.LnaPower, timeUnit)));
            }
        }
        return new ReportSection("Oscillation", paragraphs, [], figures);
    }
}
