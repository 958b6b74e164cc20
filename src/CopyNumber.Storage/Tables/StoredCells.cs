using CopyNumber.Ensembles;
using CopyNumber.Network;

namespace CopyNumber.Storage;

/// <summary>Maps the time and name columns of a stored table back to grid points and quantities.</summary>
internal static class StoredCells
{
    /// <summary>Grid time → grid index. Stored times are the grid's own doubles, so exact lookup is right.</summary>
    public static Dictionary<double, int> GridIndex(TimeGrid grid)
    {
        var index = new Dictionary<double, int>(grid.Count);
        for (var k = 0; k < grid.Count; k++) index[grid[k]] = k;
        return index;
    }

    /// <summary>Quantity name → position in <paramref name="quantities"/>.</summary>
    public static Dictionary<string, int> NameIndex(IReadOnlyList<Quantity> quantities)
    {
        var index = new Dictionary<string, int>(StringComparer.Ordinal);
        for (var q = 0; q < quantities.Count; q++) index[quantities[q].Name] = q;
        return index;
    }

    public static int Find<TKey>(Dictionary<TKey, int> index, TKey key, ParquetTableReader reader, string column) where TKey : notnull =>
        index.TryGetValue(key, out var found) ? found : throw reader.Damaged($"its column '{column}' holds {key}, which the run's {(column == "time" ? "time grid" : "model")} does not have");
}
