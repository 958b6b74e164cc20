namespace CopyNumber.MasterEquation;

/// <summary>Settings of a master-equation solve.</summary>
/// <param name="Tolerance">ε, the largest probability allowed outside the projection at any grid time (projection plus
/// time-stepping loss together); a tenth of it is given to the time stepping, the rest to the projection.</param>
/// <param name="MaxStates">The largest projection allowed; the solve stops with a message beyond it.</param>
/// <param name="Threads">Threads for the sparse products; 0 for all cores.</param>
/// <param name="Stepping">The time stepper: by <see cref="StepperRule"/> (default), or one of the two forced.</param>
public sealed record ExactOptions(double Tolerance = 1e-6, long MaxStates = 10_000_000, int Threads = 0, Stepping Stepping = Stepping.Automatic)
{
    /// <summary>Two species (indices into the network's species) whose joint law is recorded at every grid time, or null.</summary>
    public (int First, int Second)? Joint { get; init; }

    /// <summary>The most sparse products the solve may do before it stops with a message (unlimited by default).</summary>
    public long MaxProducts { get; init; } = long.MaxValue;

    /// <summary>The share of <see cref="Tolerance"/> given to the time stepping (the Poisson tails of uniformisation, the Krylov estimates).</summary>
    public const double SteppingShare = 0.1;

    /// <summary>
    /// Bytes one state costs in a solve of a network with <paramref name="dimension"/> stored coordinates and
    /// <paramref name="reactions"/> reactions: its coordinates and hash slots, the generator's entries (incoming
    /// source and rate, and the build's scratch of a target and a rate per reaction), eight vectors of doubles
    /// (probability, the step's start, result, occupancy, two product vectors, diagonal and exit rates) and the
    /// Krylov basis (m + 2 vectors of doubles, <see cref="KrylovExponential.BasisSize"/>).
    /// </summary>
    public static long BytesPerState(int dimension, int reactions) => 4L * dimension + 8 + reactions * (12L + 12L) + 8 * 8 + 16 + 8L * (KrylovExponential.BasisSize + 2);

    /// <summary>
    /// The default state limit: the states whose solve fits in half the memory this process may use
    /// (<see cref="GC.GetGCMemoryInfo()"/>'s total available bytes), at most int.MaxValue / 2.
    /// </summary>
    public static long DefaultMaxStates(int dimension, int reactions)
    {
        var available = GC.GetGCMemoryInfo().TotalAvailableMemoryBytes;
        if (available <= 0) available = 4L << 30;
        return Math.Min(int.MaxValue / 2, available / 2 / BytesPerState(dimension, reactions));
    }
}
