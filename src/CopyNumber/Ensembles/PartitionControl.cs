using CopyNumber.Network;
using CopyNumber.Randomness;

namespace CopyNumber.Ensembles;

/// <summary>
/// The share of each count's variance that binomial partitioning at division adds, estimated by a control
/// ensemble (ours; docs/methods.md "Partitioning noise"): the same model, grid and replicate count with cells
/// that split their molecules as evenly as counts allow (<see cref="CellSplit.Halves"/>), on independent
/// streams. Var_binomial − Var_halves estimates the variance that independent partitioning of each molecule
/// (Huh &amp; Paulsson 2011, Nat. Genet. 43:95) adds beyond the least partitioning error integer counts allow (the
/// ½ of an odd count, at most ¼ per division). The two ensembles are independent, so the difference's standard
/// error is √(se_b² + se_h²), each from the sample's own fourth moment, with no assumption on the laws' shape.
/// When parameters vary per cell, replicates that share a draw are not independent: each variance is then the nested
/// design's intrinsic + extrinsic estimate over its independent pairs of groups (<see cref="NoiseDecomposition"/>) and
/// its standard error the sum of the two parts' (an upper bound, by Cauchy–Schwarz: their covariance is not kept).
/// </summary>
/// <remarks>
/// For a linear network the moments are additive in the sources, so the difference is the propagated
/// partitioning variance minus the propagated parity term, exactly. For a nonlinear one the sources interact (a
/// partition error changes the rates the reactions then run at) and the difference is the total effect of
/// switching binomial partitioning on, interactions included, not a term of an additive split.
/// </remarks>
public sealed class PartitionControl
{
    /// <summary>Mixed into the run seed to give the control's seed ("halvings" in ASCII).</summary>
    public const ulong StreamTag = 0x68616C76696E6773;

    private readonly PartitionEstimate[,] _estimates;

    private PartitionControl(TimeGrid grid, IReadOnlyList<Quantity> quantities, PartitionEstimate[,] estimates)
    {
        Grid = grid;
        Quantities = quantities;
        _estimates = estimates;
    }

    /// <summary>The recording times.</summary>
    public TimeGrid Grid { get; }

    /// <summary>The count quantities (species and count readouts), in the ensemble's order.</summary>
    public IReadOnlyList<Quantity> Quantities { get; }

    /// <summary>The estimate at grid point <paramref name="point"/> for count quantity <paramref name="quantity"/>.</summary>
    public PartitionEstimate At(int point, int quantity) => _estimates[point, quantity];

    /// <summary>The control's run seed, derived from the run's.</summary>
    public static ulong SeedFor(ulong runSeed)
    {
        var state = runSeed ^ StreamTag;
        return Xoshiro256StarStar.SplitMix64(ref state);
    }

    /// <summary>Why a run of <paramref name="network"/> cannot have the control, or null when it can.</summary>
    public static string? Refusal(ReactionNetwork network)
    {
        ArgumentNullException.ThrowIfNull(network);
        return network.Cycle switch
        {
            null => "the model declares no cell cycle, so nothing is partitioned",
            { Split: CellSplit.Halves } => "the model's cells already split in halves; the control needs 'split binomial'",
            _ => null,
        };
    }

    /// <summary>
    /// Runs the control of the whole run <paramref name="main"/> (every replicate, no paths, no checkpoints) and
    /// sets it against <paramref name="result"/>, the run's own ensemble.
    /// </summary>
    /// <exception cref="ArgumentException">The network cannot have a control (<see cref="Refusal"/>).</exception>
    /// <exception cref="EnsembleFailureException">A replicate of the control failed.</exception>
    /// <returns>The estimate, or null when <paramref name="cancel"/> stopped the control before it finished.</returns>
    public static PartitionControl? Run(ReactionNetwork network, EnsembleOptions main, EnsembleResult result, EnsembleMonitor? monitor = null, CancellationToken cancel = default)
    {
        ArgumentNullException.ThrowIfNull(main);
        if (Refusal(network) is { } refusal) throw new ArgumentException(refusal, nameof(network));
        var options = main with { Seed = SeedFor(main.Seed), PathReplicates = 0, SkipBlocks = new HashSet<long>(), Shard = Shard.Whole };
        var control = EnsembleRunner.Run(network.WithSplit(CellSplit.Halves), options, null, monitor, cancel);
        return control.IsComplete && !control.Interrupted ? Estimate(result, control) : null;
    }

    /// <summary>Sets the binomial run <paramref name="model"/> against the halving control <paramref name="control"/> (same grid and quantities).</summary>
    public static PartitionControl Estimate(EnsembleResult model, EnsembleResult control)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(control);
        if (model.Grid.Count != control.Grid.Count || model.CountQuantities.Count != control.CountQuantities.Count)
            throw new ArgumentException("the control has another grid or other quantities than the run");
        var estimates = new PartitionEstimate[model.Grid.Count, model.CountQuantities.Count];
        for (var k = 0; k < model.Grid.Count; k++)
            for (var q = 0; q < model.CountQuantities.Count; q++)
                estimates[k, q] = new PartitionEstimate(VarianceEstimate.Of(model, k, q), VarianceEstimate.Of(control, k, q));
        return new PartitionControl(model.Grid, model.CountQuantities, estimates);
    }
}

/// <summary>A sample variance with its standard error.</summary>
/// <param name="Replicates">n, the replicates behind it.</param>
/// <param name="Mean">The sample mean, copies.</param>
/// <param name="Variance">The sample variance s² (divisor n − 1), copies².</param>
/// <param name="StandardError">
/// The standard error of s², √((m₄ − s⁴·(n − 3)/(n − 1))/n) with m₄ the sample's fourth central moment (common practice:
/// the variance of the sample variance, Cramér 1946, Mathematical Methods of Statistics §27.4, quoted from memory); NaN for n &lt; 4.
/// </param>
public readonly record struct VarianceEstimate(long Replicates, double Mean, double Variance, double StandardError)
{
    /// <summary>
    /// The estimate for count quantity <paramref name="quantity"/> at grid point <paramref name="point"/> of <paramref name="result"/>:
    /// from its histogram when the replicates are independent, from the nested design's pairs of groups when parameters vary per cell
    /// (the type's remarks in <see cref="PartitionControl"/>).
    /// </summary>
    public static VarianceEstimate Of(EnsembleResult result, int point, int quantity)
    {
        ArgumentNullException.ThrowIfNull(result);
        var sample = From(result.Histogram(point, quantity));
        if (result.Noise is not { } noise || noise.Pairs(point, quantity) < 2) return sample;
        var (intrinsic, extrinsic) = (noise.Intrinsic(point, quantity), noise.Extrinsic(point, quantity));
        return sample with { Variance = intrinsic.Mean + extrinsic.Mean, StandardError = intrinsic.StandardError + extrinsic.StandardError };
    }

    /// <summary>The estimate from a histogram of independent counts (its moments by <see cref="CellMoments.Of"/>).</summary>
    public static VarianceEstimate From(CountHistogram histogram)
    {
        var m = CellMoments.Of(histogram);
        var n = m.Count;
        if (n < 2) return new VarianceEstimate(n, m.Mean, double.NaN, double.NaN);
        var error = n < 4 ? double.NaN : Math.Sqrt(Math.Max(m.FourthCentral - m.Variance * m.Variance * (n - 3) / (n - 1), 0) / n);
        return new VarianceEstimate(n, m.Mean, m.Variance, error);
    }
}

/// <summary>One count's variance in the run (binomial partitioning) and in the control (halving), and what partitioning adds.</summary>
/// <param name="Model">The run's own variance.</param>
/// <param name="Control">The control's variance (cells split in halves).</param>
public readonly record struct PartitionEstimate(VarianceEstimate Model, VarianceEstimate Control)
{
    /// <summary>Var_binomial − Var_halves, copies²: the variance binomial partitioning adds (an unbiased estimate; it can fall below 0 by chance).</summary>
    public double Added => Model.Variance - Control.Variance;

    /// <summary>The standard error of <see cref="Added"/>: the two ensembles are independent.</summary>
    public double AddedStandardError => Math.Sqrt(Model.StandardError * Model.StandardError + Control.StandardError * Control.StandardError);

    /// <summary>The share of the run's variance that partitioning adds, 1 − Var_halves/Var_binomial; NaN for a variance of 0.</summary>
    public double Share => Model.Variance > 0 ? 1 - Control.Variance / Model.Variance : double.NaN;

    /// <summary>The standard error of <see cref="Share"/> by the delta method on the ratio of two independent estimates.</summary>
    public double ShareStandardError => Model.Variance > 0 && Control.Variance > 0
        ? Control.Variance / Model.Variance * Math.Sqrt(Math.Pow(Model.StandardError / Model.Variance, 2) + Math.Pow(Control.StandardError / Control.Variance, 2))
        : double.NaN;
}
