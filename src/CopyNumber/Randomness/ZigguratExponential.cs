using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;

namespace CopyNumber.Randomness;

/// <summary>
/// Exact exponential variates with rate 1 by the ziggurat method of Marsaglia &amp; Tsang (2000, "The
/// ziggurat method for generating random variables", J. Stat. Softw. 5(8)): the area under e^(−x) is
/// covered by <see cref="Layers"/> horizontal layers of equal area v. A layer is chosen uniformly, a point
/// uniformly inside it; most points fall in the part of the layer that lies wholly under the curve and are
/// returned at the cost of one multiply and one compare.
/// </summary>
/// <remarks>
/// <para>Bits: one 64-bit draw gives the layer from its low 8 bits and the abscissa from its top 53 bits
/// (bits 11–63), so the two never share a bit and the abscissa has the full resolution of a double in
/// [0, 1). (The published form takes both from one 32-bit word, and its abscissa reuses the layer's bits.)</para>
/// <para>Exactness: a point of layer i with x &lt; x_(i+1) lies under the curve and is accepted. Otherwise
/// (the wedge) a second uniform places its height in the layer and the point is accepted when it lies under
/// e^(−x), else everything is drawn again. In the base layer the part beyond r stands for the tail: since
/// Exp(1) conditioned on X &gt; r is r + Exp(1) (memorylessness), the tail is sampled as r plus a fresh
/// variate. So the law is Exp(1) exactly, up to the rounding of the tables (relative 1e-15).</para>
/// <para>Tables: r is the root of the published condition that the recurrence
/// x_(i+1) = −ln(e^(−x_i) + v/x_i), started at x_1 = r with v = (r + 1)e^(−r), reaches the top of the curve
/// (e^(−x) = 1) exactly at the last layer. It is found here by bisection at start-up; Marsaglia &amp; Tsang
/// give r = 7.69711747013104972 and v = 3.949659822581572e-3 for 256 layers, which the tests compare.</para>
/// </remarks>
public static class ZigguratExponential
{
    /// <summary>Number of layers: 256, indexed by 8 bits of the draw.</summary>
    public const int Layers = 256;

    private const double Unit = 1.0 / (1UL << 53);

    /// <summary>Edges x_0 … x_256: x_0 = v/e^(−r) (the base layer's width), x_1 = r, decreasing to x_256 = 0.</summary>
    private static readonly double[] Edges;

    /// <summary>e^(−x_i) for i = 0 … 256, with e^(−x_0) taken as 0 (the base layer reaches the axis) and e^(−x_256) = 1.</summary>
    private static readonly double[] Heights;

    /// <summary>x_i·2^−53: the abscissa of layer i is (top 53 bits)·this, so the scale is exact.</summary>
    private static readonly double[] Widths;

    static ZigguratExponential()
    {
        TailStart = SolveTailStart();
        LayerArea = (TailStart + 1) * Math.Exp(-TailStart);
        Edges = Recurrence(TailStart, out _);
        Heights = new double[Layers + 1];
        Widths = new double[Layers];
        for (var i = 1; i < Layers; i++) Heights[i] = Math.Exp(-Edges[i]);
        Heights[0] = 0.0;
        Heights[Layers] = 1.0;
        for (var i = 0; i < Layers; i++) Widths[i] = Edges[i] * Unit;
    }

    /// <summary>r: where the tail begins, the right edge of every point of the base layer's rectangle.</summary>
    public static double TailStart { get; }

    /// <summary>v: the area of each layer (the base layer's is its rectangle plus the tail beyond r).</summary>
    public static double LayerArea { get; }

    /// <summary>The right edge x_i of layer i (i = 0 … 255) and x_256 = 0; for tests and documentation.</summary>
    public static double Edge(int i) => Edges[i];

    /// <summary>
    /// One Exp(1) variate from <paramref name="bits"/> (a fresh 64-bit draw of <paramref name="rng"/>), drawing
    /// more from <paramref name="rng"/> only in the wedges and the tail (2.2% of calls: the fast path takes (1/256)·Σ x_(i+1)/x_i = 97.8%).
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static double Sample(ulong bits, ref Xoshiro256StarStar rng)
    {
        var layer = (int)(bits & (Layers - 1));
        var x = (bits >> 11) * Unsafe.Add(ref MemoryMarshal.GetArrayDataReference(Widths), layer);
        if (x < Unsafe.Add(ref MemoryMarshal.GetArrayDataReference(Edges), layer + 1)) return x;
        // A copy, so that only the copy's address escapes to the cold call and the caller's generator
        // (often a local of a hot loop) can stay in registers.
        var copy = rng;
        var value = Outside(layer, x, ref copy);
        rng = copy;
        return value;
    }

    /// <summary>The wedge test and the tail, until a point is accepted.</summary>
    [MethodImpl(MethodImplOptions.NoInlining)]
    private static double Outside(int layer, double x, ref Xoshiro256StarStar rng)
    {
        var shift = 0.0;
        while (true)
        {
            if (layer == 0) shift += TailStart;
            else if (Heights[layer] + rng.NextDouble() * (Heights[layer + 1] - Heights[layer]) < Math.Exp(-x)) return shift + x;
            var bits = rng.NextUInt64();
            layer = (int)(bits & (Layers - 1));
            x = (bits >> 11) * Widths[layer];
            if (x < Edges[layer + 1]) return shift + x;
        }
    }

    /// <summary>
    /// The edges from r by the recurrence; <paramref name="top"/> is e^(−x_255) + v/x_255, which must be 1
    /// for the last layer to end at the top of the curve (above 1: r too small; below: too large).
    /// </summary>
    private static double[] Recurrence(double r, out double top)
    {
        var v = (r + 1) * Math.Exp(-r);
        var edges = new double[Layers + 1];
        edges[0] = v / Math.Exp(-r);
        edges[1] = r;
        top = 0.0;
        for (var i = 1; i < Layers; i++)
        {
            top = Math.Exp(-edges[i]) + v / edges[i];
            if (top >= 1.0) return edges; // reached the top too early: r is too small
            if (i + 1 < Layers) edges[i + 1] = -Math.Log(top);
        }
        edges[Layers] = 0.0;
        return edges;
    }

    private static double SolveTailStart()
    {
        // top(r) decreases in r; bisection to the last representable step.
        double low = 1.0, high = 20.0;
        while (true)
        {
            var middle = 0.5 * (low + high);
            if (middle <= low || middle >= high) return high;
            Recurrence(middle, out var top);
            if (top >= 1.0) low = middle;
            else high = middle;
        }
    }
}
