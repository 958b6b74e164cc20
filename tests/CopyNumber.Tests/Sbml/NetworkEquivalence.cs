using CopyNumber.Deterministic;
using CopyNumber.Language;
using CopyNumber.Network;
using CopyNumber.Sbml;

namespace CopyNumber.Tests.Sbml;

/// <summary>
/// Export, import and the check that both compile to the same network: the same N (rows and columns matched
/// by name), the same initial state, parameters, size and time unit, the same propensities, rates, readouts,
/// schedule and triggers at random states, and the same solution of the rate equations. The reference is
/// the original model itself, evaluated independently of the SBML text.
/// </summary>
internal static class NetworkEquivalence
{
    /// <summary>Relative agreement of two evaluations of one law written two ways (a few ulps of round-off).</summary>
    public const double Relative = 1e-12;

    public static (LoadedModel Original, LoadedModel RoundTrip, SbmlExportResult Export) RoundTrip(string cnetText, string name = "model.cnet")
    {
        var original = ModelLoader.LoadText(cnetText, name);
        Assert.True(original.Model is not null, string.Join("\n", original.Diagnostics.Select(d => d.Format())) + "\n" + cnetText);
        return RoundTrip(original.Model!);
    }

    public static (LoadedModel Original, LoadedModel RoundTrip, SbmlExportResult Export) RoundTrip(LoadedModel original)
    {
        var exported = SbmlExporter.Export(original);
        Assert.True(exported.Succeeded, string.Join("\n", exported.Diagnostics.Select(d => d.Format())) + "\n" + original.Text);
        var imported = SbmlImporter.Import(exported.Xml!, "exported.xml");
        Assert.True(imported.Succeeded, string.Join("\n", imported.Diagnostics.Select(d => d.Format())) + "\n" + exported.Xml);
        var back = ModelLoader.LoadText(imported.CnetText!, "exported.xml (as imported)");
        Assert.True(back.Model is not null, string.Join("\n", back.Diagnostics.Select(d => d.Format())) + "\n" + imported.CnetText);
        return (original, back.Model!, exported);
    }

    /// <summary>Asserts that <paramref name="b"/> is <paramref name="a"/> with names renamed as <paramref name="export"/> says.</summary>
    /// <returns>Whether the rate equations could be solved (when they blow up for the original, they must for the round trip too).</returns>
    public static bool AssertSame(ReactionNetwork a, ReactionNetwork b, SbmlExportResult export, int seed, bool solve = true)
    {
        int[] Index(IReadOnlyList<string> from, IReadOnlyList<string> to, string what) => from.Select(n =>
        {
            var renamed = what == "reaction" ? export.RenamedReactions : export.Renamed;
            var i = to.ToList().IndexOf(renamed.TryGetValue(n, out var id) ? id : n);
            Assert.True(i >= 0, $"{what} '{n}' is missing after the round trip (has: {string.Join(", ", to)})");
            return i;
        }).ToArray();

        Assert.Equal(a.Species.Count, b.Species.Count);
        Assert.Equal(a.Parameters.Count, b.Parameters.Count);
        Assert.Equal(a.Reactions.Count, b.Reactions.Count);
        Assert.Equal(a.Readouts.Count, b.Readouts.Count);
        var sp = Index(a.Species, b.Species, "species");
        var pp = Index(a.Parameters, b.Parameters, "parameter");
        var rp = Index(a.Reactions.Select(r => r.Name).ToList(), b.Reactions.Select(r => r.Name).ToList(), "reaction");
        var op = Index(a.Readouts.Select(r => r.Name).ToList(), b.Readouts.Select(r => r.Name).ToList(), "readout");

        Assert.Equal(a.Size, b.Size);
        Assert.Equal(SbmlConventionsTimeUnit(a.Units.Time), b.Units.Time);
        for (var i = 0; i < a.Species.Count; i++)
        {
            Assert.Equal(a.InitialAmounts[i], b.InitialAmounts[sp[i]]);
            Assert.Equal(a.InitialCounts[i], b.InitialCounts[sp[i]]);
            Assert.Equal(a.Held[i], b.Held[sp[i]]);
            for (var j = 0; j < a.Reactions.Count; j++)
                Assert.True(a.Stoichiometry[i, j] == b.Stoichiometry[sp[i], rp[j]], $"N[{a.Species[i]}, {a.Reactions[j].Name}]: {a.Stoichiometry[i, j]} before, {b.Stoichiometry[sp[i], rp[j]]} after");
        }
        for (var p = 0; p < a.Parameters.Count; p++) Assert.Equal(a.InitialParameterValues[p], b.InitialParameterValues[pp[p]]);

        var random = new Random(seed);
        for (var trial = 0; trial < 100; trial++)
        {
            var (countsA, countsB) = Permuted(a.Species.Count, sp, _ => (long)(random.Next(8) == 0 ? random.Next(0, 2000) : random.Next(0, 40)));
            var (paramsA, paramsB) = Permuted(a.Parameters.Count, pp, p => a.InitialParameterValues[p] == 0 ? 3 * random.NextDouble() : a.InitialParameterValues[p] * (0.5 + 1.5 * random.NextDouble()));
            var (stateA, stateB) = Permuted(a.Species.Count, sp, _ => 40 * random.NextDouble());
            // Laws that read time find it in the slot after the parameters (ReactionNetwork.TimeSlot): the same random time for both.
            var time = 50 * random.NextDouble();
            (paramsA, paramsB) = ([.. paramsA, time], [.. paramsB, time]);
            var constantsA = new double[a.Reactions.Count];
            var constantsB = new double[b.Reactions.Count];
            a.Propensities.ComputeConstants(paramsA, constantsA);
            b.Propensities.ComputeConstants(paramsB, constantsB);
            var ratesA = new double[a.Reactions.Count];
            var ratesB = new double[b.Reactions.Count];
            a.RateEquations.Rates(stateA, constantsA, paramsA, ratesA);
            b.RateEquations.Rates(stateB, constantsB, paramsB, ratesB);
            for (var j = 0; j < a.Reactions.Count; j++)
            {
                Close(a.Propensities.Evaluate(j, countsA, constantsA, paramsA), b.Propensities.Evaluate(rp[j], countsB, constantsB, paramsB), $"propensity of {a.Reactions[j].Name}");
                Close(ratesA[j], ratesB[rp[j]], $"rate of {a.Reactions[j].Name}");
            }
            for (var r = 0; r < a.Readouts.Count; r++)
            {
                Close(a.Readouts[r].OnCounts(countsA, paramsA), b.Readouts[op[r]].OnCounts(countsB, paramsB), $"readout {a.Readouts[r].Name} on counts");
                Close(a.Readouts[r].OnState(stateA, paramsA), b.Readouts[op[r]].OnState(stateB, paramsB), $"readout {a.Readouts[r].Name} on a state");
            }
            Assert.Equal(a.Triggers.Count, b.Triggers.Count);
            for (var t = 0; t < a.Triggers.Count; t++)
            {
                Assert.Equal(StateTrigger.Holds(a.Triggers[t].OnCounts(countsA, paramsA)), StateTrigger.Holds(b.Triggers[t].OnCounts(countsB, paramsB)));
                Assert.Equal(StateTrigger.Holds(a.Triggers[t].OnState(stateA, paramsA)), StateTrigger.Holds(b.Triggers[t].OnState(stateB, paramsB)));
                SameEffect(a.Triggers[t].Assignments, b.Triggers[t].Assignments, countsA, countsB, paramsA, paramsB, sp, pp);
            }
            if (trial < 5)
            {
                var grid = new TimeGrid(10, 0.5);
                var timelineA = Timeline.Build(a.Schedule, grid).Changes.ToArray();
                var timelineB = Timeline.Build(b.Schedule, grid).Changes.ToArray();
                Assert.Equal(timelineA.Select(c => c.Time), timelineB.Select(c => c.Time));
                SameEffect(timelineA, timelineB, countsA, countsB, paramsA, paramsB, sp, pp);
            }
        }

        if (!solve) return false;
        // The rate equations solved on both networks, at a tight tolerance, agree to well within it.
        var options = new SolverOptions(RelativeTolerance: 1e-10, AbsoluteTolerance: 1e-10);
        var solutionGrid = new TimeGrid(3, 0.25);
        DeterministicSolution solutionA;
        try
        {
            solutionA = Simulate.RateEquations(a, solutionGrid, options);
        }
        catch (SolverFailureException)
        {
            Assert.Throws<SolverFailureException>(() => Simulate.RateEquations(b, solutionGrid, options));
            return false;
        }
        var solutionB = Simulate.RateEquations(b, solutionGrid, options);
        for (var i = 0; i < a.Species.Count; i++)
            for (var k = 0; k < solutionGrid.Count; k++)
            {
                double x = solutionA[k, i], y = solutionB[k, sp[i]];
                Assert.True(Math.Abs(x - y) <= 1e-7 * (1 + Math.Abs(x)), $"solution of {a.Species[i]} at point {k}: {x} before, {y} after");
            }
        return true;
    }

    // The time units with an SBML unit definition (second and its multiples, SBML L3V2 core section 4.4); others are not declared.
    private static string? SbmlConventionsTimeUnit(string? unit) => unit switch
    {
        "second" or "minute" or "hour" or "day" => unit,
        "ms" or "millisecond" => "millisecond",
        _ => null,
    };

    private static (T[] A, T[] B) Permuted<T>(int n, int[] map, Func<int, T> value)
    {
        var a = new T[n];
        var b = new T[n];
        for (var i = 0; i < n; i++) b[map[i]] = a[i] = value(i);
        return (a, b);
    }

    /// <summary>Applies two lists of changes, one by one, to copies of matching states and compares after each instant (the engine's rule: a species' value rounded half away from zero, ScheduledChange.Combine).</summary>
    private static void SameEffect(IReadOnlyList<ScheduledChange> a, IReadOnlyList<ScheduledChange> b, long[] countsA, long[] countsB, double[] paramsA, double[] paramsB, int[] sp, int[] pp)
    {
        long[] ca = (long[])countsA.Clone(), cb = (long[])countsB.Clone();
        double[] pa = (double[])paramsA.Clone(), pb = (double[])paramsB.Clone();
        void Apply(ScheduledChange change, long[] counts, double[] parameters)
        {
            var value = change.OnCounts(counts, parameters);
            if (change.Target == ScheduleTarget.Species)
                counts[change.TargetIndex] = change.Combine(counts[change.TargetIndex], (long)Math.Round(value, MidpointRounding.AwayFromZero));
            else parameters[change.TargetIndex] = change.Combine(parameters[change.TargetIndex], value);
        }
        Assert.Equal(a.Count, b.Count);
        for (var c = 0; c < a.Count; c++)
        {
            Apply(a[c], ca, pa);
            Apply(b[c], cb, pb);
            // One instant's changes may be composed and reordered (SBML assigns an event's variables at once): compare after the instant.
            var instantEnds = c == a.Count - 1 || (!double.IsNaN(a[c].Time) && a[c + 1].Time != a[c].Time);
            if (!instantEnds) continue;
            for (var i = 0; i < ca.Length; i++) Assert.True(ca[i] == cb[sp[i]], $"after change {c} ({a[c].TargetName}): species {i} is {ca[i]} before, {cb[sp[i]]} after");
            for (var p = 0; p < pp.Length; p++) Close(pa[p], pb[pp[p]], $"after change {c} ({a[c].TargetName}): parameter {p}");
        }
    }

    private static void Close(double x, double y, string what)
    {
        if (x == y || double.IsNaN(x) && double.IsNaN(y)) return;
        Assert.True(Math.Abs(x - y) <= Relative * Math.Max(Math.Abs(x), Math.Abs(y)), $"{what}: {x:R} before, {y:R} after");
    }
}
