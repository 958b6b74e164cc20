namespace CopyNumber.Analysis.Noise;

/// <summary>
/// The linear noise approximation's variance split by its sources (docs/methods-analysis.md §1, "Noise by
/// source"): between divisions dC/dt = J·C + C·Jᵀ + N·diag(v)·Nᵀ, at a division C ↦ M·C·Mᵀ + Σ, and C(0) = 0.
/// Both are linear in C and in the source, so C = C_r + C_p exactly, C_r the covariance fed by the reactions'
/// noise N·diag(v)·Nᵀ (with the bursts') and C_p the one fed by the partitioning variance Σ of every division
/// (Huh &amp; Paulsson 2011, Nat. Genet. 43:95), both carried by the same Jacobian J and the same jump maps M.
/// The initial covariance is 0 (the initial counts are exact) and the expansion is solved at the mean
/// parameters, so there is no third or fourth part. Values in copies² (readouts: gᵀ·C_x·g, their own units
/// squared), indexed like <see cref="SystemSizeExpansionSolution.Variance"/>.
/// </summary>
public sealed class LnaNoiseSources
{
    private readonly double[,] _reactions, _partitioning;

    internal LnaNoiseSources(double[,] reactions, double[,] partitioning, double mismatch)
    {
        _reactions = reactions;
        _partitioning = partitioning;
        Mismatch = mismatch;
    }

    /// <summary>The largest rounding misfit max|C − C_r − C_p| over every grid point and entry, relative to max|C|.</summary>
    public double Mismatch { get; }

    /// <summary>The part of the variance fed by the reactions' noise, at a grid point.</summary>
    public double Reactions(int point, int column) => _reactions[point, column];

    /// <summary>The part of the variance fed by partitioning at the divisions, at a grid point.</summary>
    public double Partitioning(int point, int column) => _partitioning[point, column];
}
