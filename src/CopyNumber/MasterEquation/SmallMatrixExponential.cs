namespace CopyNumber.MasterEquation;

/// <summary>
/// e^M for the small dense Hessenberg matrices of <see cref="KrylovExponential"/> (at most a few dozen rows),
/// by scaling and squaring with a Taylor polynomial (Moler &amp; Van Loan 2003, SIAM Rev. 45:3, "method 3"):
/// M is scaled by 2^−s until ‖M‖₁·2^−s ≤ ½, the Taylor series is summed to 18 terms (truncation below
/// ½¹⁹/19! ≈ 2·10⁻²³ relative), and the result is squared s times. Cost is O(rows³·(18 + s)), nothing
/// against one sparse product of a projection.
/// </summary>
internal static class SmallMatrixExponential
{
    private const int TaylorTerms = 18;

    /// <summary>Writes e^(scale·M) for the leading <paramref name="n"/>×<paramref name="n"/> block of <paramref name="m"/> into <paramref name="result"/>.</summary>
    public static void Compute(double[,] m, int n, double scale, double[,] result)
    {
        var norm = 0.0;
        for (var j = 0; j < n; j++)
        {
            var column = 0.0;
            for (var i = 0; i < n; i++) column += Math.Abs(m[i, j]);
            norm = Math.Max(norm, column);
        }
        norm *= Math.Abs(scale);
        var squarings = norm > 0.5 ? (int)Math.Ceiling(Math.Log2(norm / 0.5)) : 0;
        var factor = scale / Math.Pow(2, squarings);
        var a = new double[n, n];
        for (var i = 0; i < n; i++)
            for (var j = 0; j < n; j++) a[i, j] = m[i, j] * factor;

        // Horner's form: e^a ≈ I + a(I + a/2(I + a/3(… (I + a/18)))).
        var sum = new double[n, n];
        var scratch = new double[n, n];
        for (var i = 0; i < n; i++) sum[i, i] = 1;
        for (var k = TaylorTerms; k >= 1; k--)
        {
            Multiply(a, sum, scratch, n);
            for (var i = 0; i < n; i++)
                for (var j = 0; j < n; j++) sum[i, j] = (i == j ? 1 : 0) + scratch[i, j] / k;
        }
        for (var s = 0; s < squarings; s++)
        {
            Multiply(sum, sum, scratch, n);
            (sum, scratch) = (scratch, sum);
        }
        for (var i = 0; i < n; i++)
            for (var j = 0; j < n; j++) result[i, j] = sum[i, j];
    }

    // i–k–j order over rows held as spans: the inner loop streams a row of y and of the result, and skips the
    // zeros a Hessenberg matrix's powers still have in their lower-left corner.
    private static void Multiply(double[,] x, double[,] y, double[,] into, int n)
    {
        var width = into.GetLength(1);
        var flatX = System.Runtime.InteropServices.MemoryMarshal.CreateSpan(ref x[0, 0], x.Length);
        var flatY = System.Runtime.InteropServices.MemoryMarshal.CreateSpan(ref y[0, 0], y.Length);
        var flatInto = System.Runtime.InteropServices.MemoryMarshal.CreateSpan(ref into[0, 0], into.Length);
        for (var i = 0; i < n; i++)
        {
            var row = flatInto.Slice(i * width, n);
            row.Clear();
            for (var k = 0; k < n; k++)
            {
                var a = flatX[i * width + k];
                if (a == 0) continue;
                var yRow = flatY.Slice(k * width, n);
                for (var j = 0; j < n; j++) row[j] += a * yRow[j];
            }
        }
    }
}
