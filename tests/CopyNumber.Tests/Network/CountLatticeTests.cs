using CopyNumber.Network;

namespace CopyNumber.Tests.Network;

/// <summary>
/// The lattice rule (docs/methods-analysis.md): a quantity moves only by its reactions' and the
/// schedule's changes, so it stays on its initial value plus multiples of their greatest common divisor
/// (Bézout's identity; common practice). Checked on a trimerisation, where A changes by ±3 only.
/// </summary>
public sealed class CountLatticeTests
{
    private static ReactionNetwork Trimer(string schedule = "") =>
        ModelLoader.LoadText(
            "# illustrative trimerisation\nspecies\n  A = 60\n  T = 0\nparameters\n  k = 0.001\nreactions\n  pair: 3 A -> T mass k  back mass 1\n"
            + (schedule.Length > 0 ? $"changes\n  {schedule}\n" : "")
            + "readouts\n  total = A + 3*T\n  pairs = 2*T\n  spread = A - T + 1\n",
            "trimer.cnet").Model!.Network;

    // Every 0.1 to 10: grid point 50 is 5 exactly, but grid times such as 3 × 0.3 are not binary fractions.
    private static readonly TimeGrid Grid = new(10, 0.1);

    [Fact]
    public void Species_and_count_readouts_get_the_gcd_of_their_rows_of_N()
    {
        var network = Trimer();
        Assert.Equal(new CountLattice(3, 60), QuantityLattice.For(network, Grid, "A")!.At(0));
        Assert.Equal(new CountLattice(1, 0), QuantityLattice.For(network, Grid, "T")!.At(7));
        Assert.Equal(new CountLattice(2, 0), QuantityLattice.For(network, Grid, "pairs")!.At(0));
        // A − T + 1 changes by −3 − 1 = −4 and +4: every 4th count from 61.
        Assert.Equal(new CountLattice(4, 61), QuantityLattice.For(network, Grid, "spread")!.At(0));
        // A + 3T is conserved: no step at all, read on the plain integers from its value 60.
        Assert.Equal(new CountLattice(1, 60), QuantityLattice.For(network, Grid, "total")!.At(0));
        Assert.Null(QuantityLattice.For(network, Grid, "k"));
    }

    [Theory]
    [InlineData("A += 6  at time 5", 3)]   // a multiple of 3 keeps the lattice
    [InlineData("A -= 4  at time 5", 1)]   // gcd(3, 4) = 1
    [InlineData("A = 30  at time 5", 3)]   // 30 − 60 is a multiple of 3
    [InlineData("A = 31  at time 5", 1)]   // 31 − 60 = −29 is not
    [InlineData("A = A / 2  at time 5", 1)] // depends on the state: the lattice is broken
    [InlineData("A = k * 1000  at time 5", 1)] // depends on a parameter: broken too
    [InlineData("k = 1  at time 5", 3)]    // a parameter change moves no count
    public void The_schedule_refines_the_lattice_from_its_time_on(string change, long after)
    {
        var lattice = QuantityLattice.For(Trimer(change), Grid, "A")!;
        Assert.Equal(new CountLattice(3, 60), lattice.At(4.9));
        Assert.Equal(new CountLattice(after, 60), lattice.At(5));
        Assert.Equal(new CountLattice(after, 60), lattice.At(Grid[50])); // a grid time on the change reads as after it
        // T is untouched by a change of A; 'pairs' = 2T too.
        Assert.Equal(new CountLattice(2, 0), QuantityLattice.For(Trimer(change), Grid, "pairs")!.At(10));
    }

    [Fact]
    public void A_change_written_at_a_grid_time_that_is_not_a_binary_fraction_takes_effect_there()
    {
        // 3 × 0.3 = 0.8999999999999999, not 0.9: the timeline's one coincidence rule puts the change on
        // that grid point, so the lattice at grid point 3 is the refined one (common practice).
        var grid = new TimeGrid(3, 0.3);
        var lattice = QuantityLattice.For(Trimer("A += 4  at time 0.9"), grid, "A")!;
        Assert.Equal(new CountLattice(3, 60), lattice.At(grid[2]));
        Assert.Equal(new CountLattice(1, 60), lattice.At(grid[3]));
    }

    [Fact]
    public void Setting_a_species_in_a_combination_also_allows_for_where_it_was()
    {
        // spread = A − T + 1; setting T to 2 changes spread by −(2 − T) for a T anywhere on T's lattice
        // (every count), so spread loses its lattice of 4.
        var lattice = QuantityLattice.For(Trimer("T = 2  at time 5"), Grid, "spread")!;
        Assert.Equal(new CountLattice(4, 61), lattice.At(1));
        Assert.Equal(new CountLattice(1, 61), lattice.At(6));
    }

    [Fact]
    public void Lattice_points_and_indices()
    {
        var lattice = new CountLattice(3, 60);
        Assert.True(lattice.Contains(0));
        Assert.True(lattice.Contains(-3));
        Assert.False(lattice.Contains(61));
        Assert.Equal(-20, lattice.IndexOf(0));
        Assert.Equal(-21, lattice.IndexOf(-2)); // off the lattice: rounded down
        Assert.Equal(-3, lattice.ValueAt(-21));
    }
}
