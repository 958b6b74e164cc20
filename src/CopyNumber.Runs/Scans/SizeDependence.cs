using System.Globalization;
using CopyNumber.Network;

namespace CopyNumber.Runs.Scans;

/// <summary>
/// Whether a model's dynamics in counts change with the system size Ω. A sweep over Ω scales the initial
/// counts by Ω/Ω₀ and recompiles every law at the new Ω: a mass-action constant of order m becomes
/// c = k·Ω^(1−m), a rate law reads <c>size</c> where it is written, parameters defined through <c>size</c>
/// change. A model in which none of that happens (first-order mass action and rate laws that never read
/// <c>size</c>) has the same propensities a(x) at every Ω: a sweep would only start it elsewhere.
/// </summary>
public static class SizeDependence
{
    /// <summary>Probe counts per species at which the propensities of two sizes are compared.</summary>
    private static readonly long[] ProbeCounts = [0, 1, 2, 3, 7, 20, 150, 4000];

    /// <summary>Relative difference below which two propensities are the same (round-off of Ω^(1−m) with m = 1 is exact; 1e-12 leaves room for rate laws).</summary>
    private const double SameWithin = 1e-12;

    /// <summary>
    /// Null when the model's propensities change with Ω; otherwise the sentence saying why a sweep over Ω
    /// would not change its dynamics. Compares a(x) compiled at Ω₀ and at 2Ω₀ at the initial counts and at
    /// states with every species at 0, 1, 2, 3, 7, 20, 150 and 4000 copies (and each species alone at them).
    /// </summary>
    public static string? WhySweepChangesNothing(LoadedModel model)
    {
        ArgumentNullException.ThrowIfNull(model);
        var here = model.Network;
        var other = ModelLoader.LoadText(model.Text, model.Path, new CompileOptions(SizeOverride: 2 * here.Size)).Model?.Network;
        if (other is null) return null; // the doubled size does not compile (a count overflows): the sweep itself will say so
        if (ParametersDiffer(here, other)) return null;
        var a = new double[here.Propensities.Count];
        var b = new double[here.Propensities.Count];
        var constantsA = new double[a.Length];
        var constantsB = new double[b.Length];
        var parametersA = here.InitialParameterValues.ToArray();
        var parametersB = other.InitialParameterValues.ToArray();
        here.Propensities.ComputeConstants(parametersA, constantsA);
        other.Propensities.ComputeConstants(parametersB, constantsB);
        foreach (var state in ProbeStates(here))
        {
            try
            {
                here.Propensities.EvaluateAll(state, constantsA, parametersA, a);
                other.Propensities.EvaluateAll(state, constantsB, parametersB, b);
            }
            catch (ArithmeticException)
            {
                continue; // a law undefined at a probe state says nothing about the size
            }
            for (var j = 0; j < a.Length; j++)
                if (Differ(a[j], b[j])) return null;
        }
        var initial = string.Join(", ", here.Species.Take(3).Select((s, i) => $"{s} would start at {(here.InitialCounts[i] * 10).ToString(CultureInfo.InvariantCulture)}"));
        return $"a sweep over the system size would not change the dynamics of '{here.Name}': none of its laws uses size " +
               "(every mass-action reaction is first order, whose constant is the same at every size, and no rate law or parameter reads 'size'), " +
               "so its propensities in counts are the same at every size and only the initial counts would be multiplied by it " +
               $"(at 10 times its size {initial}). Write the laws in concentrations (mass action of another order, or 'size' in the rate laws), " +
               "or vary what you mean to vary with 'copynumber scan --vary NAME=SPEC' (a parameter or an initial count).";
    }

    private static bool ParametersDiffer(ReactionNetwork a, ReactionNetwork b)
    {
        for (var p = 0; p < a.InitialParameterValues.Count; p++)
            if (Differ(a.InitialParameterValues[p], b.InitialParameterValues[p])) return true;
        return false;
    }

    private static bool Differ(double x, double y) =>
        !(x == y || Math.Abs(x - y) <= SameWithin * Math.Max(Math.Abs(x), Math.Abs(y))) && !(double.IsNaN(x) && double.IsNaN(y));

    private static IEnumerable<long[]> ProbeStates(ReactionNetwork network)
    {
        var species = network.Species.Count;
        yield return network.InitialCounts.ToArray();
        foreach (var count in ProbeCounts)
        {
            yield return Enumerable.Repeat(count, species).ToArray();
            for (var i = 0; i < species && species > 1; i++)
            {
                var state = network.InitialCounts.ToArray();
                state[i] = count;
                yield return state;
            }
        }
    }
}
