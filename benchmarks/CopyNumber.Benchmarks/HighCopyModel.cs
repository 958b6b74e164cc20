using CopyNumber.Network;

namespace CopyNumber.Benchmarks;

/// <summary>
/// A high-copy nonlinear model for the tau-leaping benchmark: monomers A made at 10^4 per unit time, lost at
/// 0.1 per molecule, paired into dimers D (2 A → D, propensity 10^-7·a(a−1)) that are cleared at 0.1 per
/// molecule. The rate equations' steady state is a ≈ 85 400, d ≈ 7 290, where each replicate starts; a
/// replicate runs to t = 10 on a grid of step 1 (about 2·10^5 events for an exact method). The same model
/// is built in tests/CopyNumber.Tests/Stochastic/TauLeapingAccuracyTests.cs, which checks that
/// tau-leaping's mean agrees with the direct method's within 1%.
/// </summary>
internal static class HighCopyModel
{
    public const double Until = 10;
    public const double Every = 1;

    private const string Text = """
        # High-copy monomer-dimer model for the tau-leaping benchmark (invented values).
        size 1
        species
          A = 85400
          D = 7290
        parameters
          k_make  = 1e4
          k_loss  = 0.1
          k_pair  = 1e-7
          k_clear = 0.1
        reactions
          make:  0 -> A      mass k_make
          loss:  A -> 0      mass k_loss
          pair:  2 A -> D    mass k_pair
          clear: D -> 0      mass k_clear
        """;

    public static ReactionNetwork Load()
    {
        var outcome = ModelLoader.LoadText(Text, "high_copy.cnet");
        if (outcome.Model is null)
            throw new InvalidOperationException(string.Join("\n", outcome.Diagnostics.Select(d => d.Format())));
        return outcome.Model.Network;
    }
}
