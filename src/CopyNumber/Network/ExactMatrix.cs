using System.Numerics;

namespace CopyNumber.Network;

/// <summary>
/// Exact integer linear algebra for the structure of N: no floating point anywhere, because a rank
/// decided under rounding can invent or lose a conservation law (entries near 10^12 already defeat
/// double precision).
/// </summary>
/// <remarks>
/// Elimination is fraction-free Gauss–Jordan over <see cref="BigInteger"/>: a row is cleared by
/// cross-multiplication (row_i ← a·row_i − b·row_p with a/b the reduced ratio of the two entries) and
/// then divided by the gcd of its entries. Every intermediate row is then the primitive integer multiple
/// of a row of the rational partially reduced matrix, whose entries are ratios of minors, so the numbers
/// stay within Hadamard's bound for the minors — the same guarantee fraction-free elimination gives in
/// Bareiss 1968, Math. Comp. 22:565.
/// </remarks>
internal static class ExactMatrix
{
    /// <summary>The rows of <paramref name="matrix"/>, or of its transpose, as BigInteger arrays.</summary>
    public static BigInteger[][] ToRows(long[,] matrix, bool transpose)
    {
        var rows = matrix.GetLength(transpose ? 1 : 0);
        var columns = matrix.GetLength(transpose ? 0 : 1);
        var result = new BigInteger[rows][];
        for (var r = 0; r < rows; r++)
        {
            result[r] = new BigInteger[columns];
            for (var c = 0; c < columns; c++) result[r][c] = transpose ? matrix[c, r] : matrix[r, c];
        }
        return result;
    }

    /// <summary>
    /// Brings <paramref name="rows"/> to integer reduced row echelon form in place: afterwards row k
    /// (k &lt; rank) has a positive pivot in column <c>pivots[k]</c>, zeros in every other pivot column and
    /// zeros left of its pivot; rows from rank on are zero. Pivot columns are the earliest columns that are
    /// linearly independent of the columns before them.
    /// </summary>
    /// <returns>The pivot columns, increasing; their number is the rank.</returns>
    public static int[] Reduce(BigInteger[][] rows)
    {
        var columns = rows.Length == 0 ? 0 : rows[0].Length;
        var pivots = new List<int>();
        for (var c = 0; c < columns && pivots.Count < rows.Length; c++)
        {
            var top = pivots.Count;
            var p = SmallestNonzero(rows, top, c);
            if (p < 0) continue;
            (rows[top], rows[p]) = (rows[p], rows[top]);
            var pivotRow = rows[top];
            MakePrimitive(pivotRow, firstNonzeroPositive: true);
            for (var i = 0; i < rows.Length; i++)
                if (i != top && !rows[i][c].IsZero) Clear(rows[i], pivotRow, c);
            pivots.Add(c);
        }
        return pivots.ToArray();
    }

    /// <summary>Exact rank of a (possibly empty) integer matrix.</summary>
    public static int Rank(long[,] matrix) => Reduce(ToRows(matrix, transpose: false)).Length;

    /// <summary>
    /// Divides <paramref name="v"/> by the gcd of its entries and, if asked, flips its sign so that the
    /// first nonzero entry is positive. The zero vector is left alone.
    /// </summary>
    public static void MakePrimitive(BigInteger[] v, bool firstNonzeroPositive)
    {
        var g = BigInteger.Zero;
        var first = BigInteger.Zero;
        foreach (var x in v)
        {
            if (x.IsZero) continue;
            if (first.IsZero) first = x;
            g = BigInteger.GreatestCommonDivisor(g, x);
        }
        if (g.IsZero) return;
        if (firstNonzeroPositive && first.Sign < 0) g = -g;
        if (g.IsOne) return;
        for (var i = 0; i < v.Length; i++) v[i] /= g;
    }

    // Pivoting on the smallest entry keeps the cross-multipliers small; the choice does not change the
    // pivot columns, which depend on the matrix alone.
    private static int SmallestNonzero(BigInteger[][] rows, int from, int column)
    {
        var best = -1;
        var bestSize = BigInteger.Zero;
        for (var i = from; i < rows.Length; i++)
        {
            var size = BigInteger.Abs(rows[i][column]);
            if (size.IsZero || (best >= 0 && size >= bestSize)) continue;
            best = i;
            bestSize = size;
        }
        return best;
    }

    private static void Clear(BigInteger[] row, BigInteger[] pivotRow, int column)
    {
        var g = BigInteger.GreatestCommonDivisor(pivotRow[column], row[column]);
        var a = pivotRow[column] / g;
        var b = row[column] / g;
        for (var j = 0; j < row.Length; j++) row[j] = a * row[j] - b * pivotRow[j];
        MakePrimitive(row, firstNonzeroPositive: false);
    }
}
