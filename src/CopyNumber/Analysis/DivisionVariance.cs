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
/// p_i = N_i/(2G) (common practice: sampling without replacement). The gene counts N fluctuate (a promoter's states),
/// so the law of total variance takes the mean of that covariance over N: E[p·pᵀ] = p̄·p̄ᵀ + C/(2G)², which gives
/// Σ₀ − C/(4(2G − 1)) on the gene block, Σ₀ at the mean counts. The second term is linear in C: it belongs to the jump
/// map (<see cref="ShareGeneCopies"/>, applied to every source's covariance), the first to the injection
/// (<see cref="AddBeforeHalving"/>). For one copy (G = 1) the gene block after division is then exactly Σ₀ = diag p̄ − p̄·p̄ᵀ,
/// the law of a single copy's state; evaluated at the mean alone it was C/4 too large (a 0/1 promoter shared at p̄ = ½:
/// 0.375 instead of ¼).
/// </remarks>
internal static class DivisionVariance
{
    /// <summary>
    /// The part of the gene copies' sharing that is linear in the covariance: −C_ab/(2G − 1) on the gene block, before the
    /// halving (so −C/(4(2G − 1)) after it). Applied to the whole covariance and to each source's part alike.
    /// </summary>
    public static void ShareGeneCopies(CellCycle cycle, ReadOnlySpan<double> phi, double[,] covariance)
    {
        var total = 0.0;
        foreach (var g in cycle.Genes) total += phi[g];
        if (!(total > 1)) return;
        var genes = cycle.Genes.ToArray();
        var shrink = new double[genes.Length, genes.Length];
        for (var a = 0; a < genes.Length; a++)
            for (var b = 0; b < genes.Length; b++) shrink[a, b] = covariance[genes[a], genes[b]] / (total - 1);
        for (var a = 0; a < genes.Length; a++)
            for (var b = 0; b < genes.Length; b++) covariance[genes[a], genes[b]] -= shrink[a, b];
    }

    /// <summary>Adds 4Σ₀ to <paramref name="covariance"/> for a division at the counts <paramref name="phi"/>.</summary>
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
