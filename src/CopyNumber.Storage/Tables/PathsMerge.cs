namespace CopyNumber.Storage;

/// <summary>
/// Combines <c>paths.parquet</c> files over disjoint sets of replicates into one, rows in replicate
/// order as one run writes them: each source is in replicate order, so this is a k-way merge that
/// reads one row group per source at a time.
/// </summary>
internal static class PathsMerge
{
    private const int RowsPerGroup = 1 << 18;

    /// <summary>Writes <paramref name="destination"/> from <paramref name="sources"/>, which must have the columns <paramref name="columns"/>.</summary>
    /// <exception cref="RunFolderException">A source is unreadable, has other columns, or shares a replicate with another.</exception>
    /// <exception cref="OutputException">The destination could not be written.</exception>
    public static void Write(IReadOnlyList<string> sources, string destination, IReadOnlyList<ColumnSpec> columns, IReadOnlyDictionary<string, string> metadata)
    {
        var cursors = new List<Cursor>();
        ParquetTableWriter? writer = null;
        try
        {
            foreach (var source in sources) cursors.Add(new Cursor(ParquetTableReader.Open(source), columns));
            writer = ParquetTableWriter.Create(destination, columns, metadata);
            var buffer = columns.Select(c => c.Type == ColumnType.Double ? (Array)new double[RowsPerGroup] : new long[RowsPerGroup]).ToArray();
            var rows = 0;
            var last = -1L;
            while (true)
            {
                Cursor? next = null;
                foreach (var c in cursors)
                    if (c.HasRow && (next is null || c.Replicate < next.Replicate)) next = c;
                if (next is null) break;
                var replicate = next.Replicate;
                if (replicate <= last) throw next.Reader.Damaged($"replicate {replicate} appears in more than one source, or out of order");
                while (next.HasRow && next.Replicate == replicate)
                {
                    next.CopyRow(buffer, rows);
                    if (++rows == RowsPerGroup)
                    {
                        writer.WriteRowGroup(buffer, rows);
                        rows = 0;
                    }
                }
                last = replicate;
            }
            if (rows > 0) writer.WriteRowGroup(buffer, rows);
            // The sources are closed before the result is renamed into place, since it may replace one of them.
            foreach (var c in cursors) c.Reader.Dispose();
            cursors.Clear();
            writer.Complete();
        }
        finally
        {
            foreach (var c in cursors) c.Reader.Dispose();
            writer?.Dispose();
        }
    }

    /// <summary>One source, one row group in memory at a time.</summary>
    private sealed class Cursor
    {
        private readonly IReadOnlyList<ColumnSpec> _columns;
        private Array[] _group = [];
        private long[] _replicates = [];
        private int _row;
        private int _nextGroup;

        public Cursor(ParquetTableReader reader, IReadOnlyList<ColumnSpec> columns)
        {
            Reader = reader;
            _columns = columns;
            if (!reader.ColumnNames.SequenceEqual(columns.Select(c => c.Name)))
                throw reader.Damaged($"its columns ({string.Join(", ", reader.ColumnNames)}) are not those of this model's paths ({string.Join(", ", columns.Select(c => c.Name))})");
            Advance();
        }

        public ParquetTableReader Reader { get; }

        public bool HasRow => _row < _replicates.Length;

        public long Replicate => _replicates[_row];

        public void CopyRow(Array[] buffer, int at)
        {
            for (var c = 0; c < _columns.Count; c++)
            {
                if (buffer[c] is double[] reals) reals[at] = ((double[])_group[c])[_row];
                else ((long[])buffer[c])[at] = ((long[])_group[c])[_row];
            }
            _row++;
            if (_row == _replicates.Length) Advance();
        }

        private void Advance()
        {
            while (_nextGroup < Reader.RowGroups)
            {
                var g = _nextGroup++;
                _group = _columns.Select(c => c.Type == ColumnType.Double ? (Array)Reader.Doubles(c.Name, g) : Reader.Longs(c.Name, g)).ToArray();
                _replicates = (long[])_group[0];
                _row = 0;
                if (_replicates.Length > 0) return;
            }
            _replicates = [];
            _row = 0;
        }
    }
}
