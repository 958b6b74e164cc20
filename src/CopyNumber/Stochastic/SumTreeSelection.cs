using System.Numerics;
using System.Runtime.CompilerServices;
using CopyNumber.Randomness;

namespace CopyNumber.Stochastic;

/// <summary>
/// Selection in O(log M) for large networks: a complete binary tree whose leaves are the propensities and
/// whose inner nodes hold the sums of their children; selecting descends from the root, updating a
/// propensity recomputes the sums on its path (common practice). Each inner node is recomputed as the
/// sum of its two children, never updated by differences, so the total cannot drift.
/// </summary>
internal struct SumTreeSelection : IReactionSelection<SumTreeSelection>
{
    // Node 1 is the root; node i has children 2i and 2i+1; leaf of reaction j is node _leaves + j.
    private double[] _nodes;
    private int _leaves;
    private int _reactions;

    public static SumTreeSelection Create(int reactions)
    {
        var leaves = (int)BitOperations.RoundUpToPowerOf2((uint)Math.Max(reactions, 1));
        return new SumTreeSelection { _nodes = new double[2 * leaves], _leaves = leaves, _reactions = reactions };
    }

    public readonly double Total
    {
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        get => _nodes[1];
    }

    public readonly ReadOnlySpan<double> Propensities => _nodes.AsSpan(_leaves, _reactions);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public readonly void Set(int reaction, double propensity)
    {
        var nodes = _nodes;
        var i = _leaves + reaction;
        nodes[i] = propensity;
        for (i >>= 1; i >= 1; i >>= 1) nodes[i] = nodes[2 * i] + nodes[2 * i + 1];
    }

    /// <remarks>The root is recomputed from its children, so the total needs nothing from the caller.</remarks>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public readonly double Replace(int reaction, double propensity)
    {
        var change = propensity - _nodes[_leaves + reaction];
        Set(reaction, propensity);
        return change;
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public readonly void AddToTotal(double change)
    {
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public readonly int Select(double point, ref Xoshiro256StarStar rng) => Select(point);

    /// <summary>The reaction whose cumulative interval holds <paramref name="point"/>; needs no further random numbers.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public readonly int Select(double point)
    {
        var nodes = _nodes;
        var i = 1;
        while (i < _leaves)
        {
            var left = nodes[2 * i];
            // Going right only into a subtree with a positive sum keeps every node visited positive, so
            // the leaf reached has a_j > 0 however the subtraction rounds.
            if (point < left || !(nodes[2 * i + 1] > 0.0)) i = 2 * i;
            else
            {
                point -= left;
                i = 2 * i + 1;
            }
        }
        return i - _leaves;
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public readonly void EndEvent()
    {
    }

    /// <remarks>Nothing to forget: every propensity is set again in reaction order and a0 re-summed from them at a replicate's start.</remarks>
    public readonly void Restart()
    {
    }

    public readonly void Resum()
    {
        for (var i = _leaves - 1; i >= 1; i--) _nodes[i] = _nodes[2 * i] + _nodes[2 * i + 1];
    }
}
