using CopyNumber.Network;
using CopyNumber.Randomness;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// N built from sparse columns (for networks too large for a dense species × reactions matrix, such as the
/// benchmarks' 10^5-reaction networks) is the same matrix as N built dense, entry by entry (common practice:
/// a sparse matrix format must represent exactly the matrix it stores).
/// </summary>
public sealed class SparseStoichiometryTests
{
    [Fact]
    public void ColumnsGiveTheSameMatrixAsTheDenseForm()
    {
        const int species = 7, reactions = 40;
        var rng = new Xoshiro256StarStar(1936);
        var dense = new long[species, reactions];
        var columns = new List<IReadOnlyList<(int, long)>>();
        for (var j = 0; j < reactions; j++)
        {
            // Repeated species within a column (added up) and entries that cancel to 0 (left out).
            var column = new List<(int, long)>();
            for (var e = 0; e < 4; e++)
            {
                var i = (int)(rng.NextUInt64() % species);
                var change = (long)(rng.NextUInt64() % 5) - 2;
                column.Add((i, change));
                dense[i, j] += change;
            }
            columns.Add(column);
        }
        var fromDense = new Stoichiometry(dense);
        var fromColumns = new Stoichiometry(species, columns);

        Assert.Equal(species, fromColumns.SpeciesCount);
        Assert.Equal(reactions, fromColumns.ReactionCount);
        Assert.Equal(fromDense.ToDense(), fromColumns.ToDense());
        for (var j = 0; j < reactions; j++)
        {
            Assert.Equal(fromDense.ChangedSpecies(j).ToArray(), fromColumns.ChangedSpecies(j).ToArray());
            Assert.Equal(fromDense.Changes(j).ToArray(), fromColumns.Changes(j).ToArray());
            for (var i = 0; i < species; i++) Assert.Equal(dense[i, j], fromColumns[i, j]);
        }
    }

    [Fact]
    public void ASpeciesIndexOutsideTheRowsIsRejected()
    {
        var error = Assert.Throws<ArgumentException>(() => new Stoichiometry(2, [[(2, 1L)]]));
        Assert.Contains("species index 2", error.Message);
    }
}
