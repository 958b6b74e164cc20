using System.Globalization;
using CopyNumber.Network;

namespace CopyNumber.Tests.Analysis.Oscillation;

/// <summary>The models the oscillation tests share, written in the network language.</summary>
internal static class OscillationModels
{
    /// <summary>
    /// The Brusselator (Prigogine & Lefever 1968, J. Chem. Phys. 48:1695): 0 → X (A), X → Y (B), 2X + Y → 3X (1),
    /// X → 0 (1), in concentrations at system size Ω. Steady state X = A, Y = B/A; Jacobian [[B − 1, A²], [−B, −A²]],
    /// a Hopf bifurcation at B = 1 + A² with frequency A there.
    /// </summary>
    public static ReactionNetwork Brusselator(double a, double b, double size = 1, double? x0 = null, double? y0 = null) =>
        Simulate.Network(string.Create(CultureInfo.InvariantCulture, $"""
            size {size}
            species
              X = {Math.Round((x0 ?? a * 1.1) * size)}
              Y = {Math.Round((y0 ?? b / a) * size)}
            parameters
              A = {a}
              B = {b}
            reactions
              make:    0 -> X          mass A
              convert: X -> Y          mass B
              autocat: 2 X + Y -> 3 X  mass 1
              decay:   X -> 0          mass 1
            """), "brusselator.cnet");

    /// <summary>The bundled three-gene ring (scenarios/ring_oscillator.cnet), read from the repository.</summary>
    public static ReactionNetwork Ring() => Simulate.Network(File.ReadAllText(Path.Combine(CopyNumber.Tests.Language.LanguageTestSupport.ScenariosFolder(), "ring_oscillator.cnet")), "ring_oscillator.cnet");

    /// <summary>Two-stage gene expression, mRNA → protein, both first order: eigenvalues −d_m and −d_p, real (no ringing possible).</summary>
    public static ReactionNetwork TwoStage() => Simulate.Network("""
        species
          m = 5
          p = 50
        reactions
          tx:  0 -> m      mass 5
          tl:  m -> m + p  mass 2
          dm:  m -> 0      mass 1
          dp:  p -> 0      mass 0.2
        """, "two_stage.cnet");
}
