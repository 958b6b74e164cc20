using System.Text.Json.Nodes;
using CopyNumber.MasterEquation;
using CopyNumber.Network;
using CopyNumber.Storage;

namespace CopyNumber.Runs;

/// <summary>What the exact check of an ensemble found, or why it was not done.</summary>
/// <param name="Agreement">The comparison, or null when it was skipped.</param>
/// <param name="Skipped">Why it was skipped (null when done).</param>
/// <param name="Asked">True when the user asked for it (--check-exact), false when it ran by the automatic rule.</param>
public sealed record ExactCheckOutcome(EnsembleAgreement? Agreement, string? Skipped, bool Asked)
{
    /// <summary>The lines the console shows: one per quantity and the level, or why an asked-for check was skipped (nothing for a skipped automatic one).</summary>
    public string Describe()
    {
        var inv = System.Globalization.CultureInfo.InvariantCulture;
        if (Agreement is not { } a) return Asked ? $"exact check skipped: {Skipped}\n" : "";
        var text = new System.Text.StringBuilder();
        text.Append(inv, $"exact check ({(Asked ? "asked" : "automatic: the master equation is small")}; {a.States:N0} states, projection bound ≤ {a.LargestBound:G2}): ")
            .Append(a.Agrees ? "the ensemble agrees with the exact law" : "THE ENSEMBLE DISAGREES WITH THE EXACT LAW")
            .Append(inv, $" at family-wise level {a.FamilyWiseLevel:G2} over {a.Tests} tests (grid times × count quantities, Bonferroni)\n");
        foreach (var q in a.Quantities)
            text.Append(inv, $"  {q.Quantity}: largest Kolmogorov distance {q.LargestDistance:0.0000} at t = {q.Time:G6} ({q.Replicates} replicates; allowed {q.Allowed:0.0000}) {(q.Agrees ? "agrees" : "disagrees")}\n");
        return text.ToString();
    }
}

/// <summary>
/// <c>simulate … --check-exact</c>: after a finished ensemble, solves the master equation of the same network on
/// the run's grid and compares every count quantity's histograms with the exact law
/// (<see cref="EnsembleAgreementTest"/>, family-wise level <see cref="EnsembleAgreementTest.DefaultLevel"/>), then
/// adds the result to manifest.json under <see cref="ManifestField"/>. Automatic rule: without the option the
/// check runs when the solve stays small — at most <see cref="AutomaticStates"/> states and
/// <see cref="AutomaticProducts"/> sparse products (≤ 10⁹ state-updates, seconds) — and is silently skipped
/// otherwise; <c>--check-exact false</c> turns it off. Asked for, the solve gets the default state limit.
/// </summary>
public static class ExactCheck
{
    /// <summary>The manifest field holding the check.</summary>
    public const string ManifestField = ManifestFields.ExactCheck;

    /// <summary>The automatic rule's state limit.</summary>
    public const long AutomaticStates = 20_000;

    /// <summary>The automatic rule's limit on sparse products.</summary>
    public const long AutomaticProducts = 50_000;

    /// <summary>The projection tolerance of the check's solve.</summary>
    public const double Tolerance = 1e-6;

    /// <summary>Runs the check on the finished run in <paramref name="folder"/> and records it in its manifest.</summary>
    /// <exception cref="OutputException">The manifest cannot be rewritten.</exception>
    public static ExactCheckOutcome Run(string folder, ReactionNetwork network, TimeGrid grid, bool asked, int threads, CancellationToken cancel = default)
    {
        ArgumentNullException.ThrowIfNull(network);
        var coding = StateCoding.For(network);
        var options = asked
            ? new ExactOptions(Tolerance, ExactOptions.DefaultMaxStates(coding.Dimension, network.Reactions.Count), threads)
            : new ExactOptions(Tolerance, AutomaticStates, threads) { MaxProducts = AutomaticProducts };
        ExactCheckOutcome outcome;
        try
        {
            var exact = FiniteStateProjection.Solve(network, grid, options, cancel);
            var run = RunFolder.Read(folder);
            var series = run.Quantities.ToDictionary(s => s.Name);
            EnsembleHistogram? Histogram(string name, int k)
            {
                if (!series.TryGetValue(name, out var s) || k >= s.Replicates.Length || s.Replicates[k] < 1) return null;
                var (counts, probabilities) = run.Distribution(name, k);
                return counts.Length == 0 ? null : new EnsembleHistogram(counts, probabilities, s.Replicates[k]);
            }
            outcome = new ExactCheckOutcome(EnsembleAgreementTest.Compare(exact, Histogram), null, asked);
        }
        catch (Exception e) when (e is MasterEquationException or UnsupportedModelException)
        {
            // A model the master equation cannot take (too large, state-triggered changes): no check, and the run stands.
            outcome = new ExactCheckOutcome(null, e.Message, asked);
        }
        if (outcome.Agreement is null && !asked) return outcome;
        var path = Path.Combine(folder, RunFiles.Manifest);
        var manifest = RunManifest.Read(path);
        manifest.Extra[ManifestField] = ToJson(outcome);
        manifest.WriteAtomic(path);
        return outcome;
    }

    private static JsonObject ToJson(ExactCheckOutcome outcome)
    {
        if (outcome.Agreement is not { } a) return new JsonObject { ["skipped"] = outcome.Skipped };
        var quantities = new JsonArray();
        foreach (var q in a.Quantities)
            quantities.Add(new JsonObject
            {
                ["quantity"] = q.Quantity,
                ["largest_kolmogorov_distance"] = q.LargestDistance,
                ["time"] = q.Time,
                ["allowed"] = q.Allowed,
                ["replicates"] = q.Replicates,
                ["agrees"] = q.Agrees,
            });
        return new JsonObject
        {
            ["method"] = "Kolmogorov distance per count quantity and grid time, Bonferroni over all of them",
            ["family_wise_level"] = a.FamilyWiseLevel,
            ["tests"] = a.Tests,
            ["states"] = a.States,
            ["largest_projection_bound"] = a.LargestBound,
            ["agrees"] = a.Agrees,
            ["quantities"] = quantities,
        };
    }
}
