using CopyNumber.Network;

namespace CopyNumber.Analysis;

/// <summary>
/// The linear noise approximation across a division of the mean cell (docs/methods.md "Growth and
/// division"): C ↦ M·C·Mᵀ + Σ, M the halving (and, for genes, the doubling) of each species, carried out by
/// the timed changes themselves, and Σ the partitioning variance added here, at the division's first change
/// (the birth time moving on), as 4Σ before the halving so that M·4Σ·Mᵀ = Σ.
/// </summary>
/// <remarks>
/// Σ at the counts N = φ before division: binomial split, Var(D | N) = N/4 per species, independent;
/// halves, ¼·P(N odd) ≈ ⅛ per species (P(N odd) taken as ½: the LNA's law is continuous; ours); gene species,
/// the multivariate hypergeometric law of G copies drawn from 2G = Σ genes, Cov = G·G/(2G − 1)·(diag p − p·pᵀ),
/// p_i = N_i/(2G) (common practice: sampling without replacement).
/// </remarks>
internal static class DivisionVariance
{
    /// <summary>Adds 4Σ to <paramref name="covariance"/> for a division at the counts <paramref name="phi"/>.</summary>
    public static void AddBeforeHalving(ReactionNetwork network, CellCycle cycle, ReadOnlySpan<double> phi, double[,] covariance)
    {
        for (var i = 0; i < phi.Length; i++)
        {
            if (network.Held[i] || cycle.IsGene(i)) continue;
            covariance[i, i] += cycle.Split == CellSplit.Binomial ? Math.Max(phi[i], 0) : 0.5;
        }
        var total = 0.0;
        foreach (var g in cycle.Genes) total += phi[g];
        if (!(total > 1)) return;
        var drawn = total / 2;
        var factor = 4 * drawn * drawn / (total - 1);
        foreach (var a in cycle.Genes)
            foreach (var b in cycle.Genes)
                covariance[a, b] += factor * ((a == b ? phi[a] / total : 0) - phi[a] / total * (phi[b] / total));
    }
}
