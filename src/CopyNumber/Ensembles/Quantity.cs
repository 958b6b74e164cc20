namespace CopyNumber.Ensembles;

/// <summary>
/// Something an ensemble reports at every grid time: a species, or a readout. Counts get exact
/// histograms; real-valued readouts get moments only.
/// </summary>
/// <param name="Name">Species or readout name.</param>
/// <param name="IsCount">True for species and integer readouts.</param>
/// <param name="ReadoutIndex">Index into the network's readouts, or −1 for a species.</param>
/// <param name="SpeciesIndex">Index into the network's species, or −1 for a readout.</param>
public sealed record Quantity(string Name, bool IsCount, int SpeciesIndex, int ReadoutIndex)
{
    /// <summary>Species first, in declaration order, then readouts.</summary>
    public static IReadOnlyList<Quantity> Of(Network.ReactionNetwork network) =>
        network.Species.Select((s, i) => new Quantity(s, true, i, -1))
            .Concat(network.Readouts.Select((r, k) => new Quantity(r.Name, r.IsCount, -1, k)))
            .ToArray();
}
