using System.Globalization;
using System.Text;

namespace CopyNumber.Tests.Sbml;

/// <summary>
/// Random models in the network language, for round-trip tests (random generation of valid inputs is
/// common practice). Each covers some of: mass action of order 0 to 3 (coefficients up to 3), rate laws with
/// Hill and saturation functions, comparisons, choose, min, sqrt, exp and log, reversible lines, parameters
/// defined from earlier ones, held species, readouts, a time unit, timed changes (once, repeating, several
/// assignments on a line) and a state-triggered change. Rates are small and runs short so the rate
/// equations stay tame. A trigger's condition reads only species no other line sets (the one case the
/// export refuses; tested separately).
/// </summary>
internal static class RandomNetworks
{
    private static readonly string[] TimeUnits = ["minute", "second", "hour", "day", "ms", "fortnight"];

    public static string Generate(Random random)
    {
        string Number(double x) => x.ToString("R", CultureInfo.InvariantCulture);
        double Uniform(double a, double b) => a + (b - a) * random.NextDouble();
        T Pick<T>(IReadOnlyList<T> items) => items[random.Next(items.Count)];

        var text = new StringBuilder();
        text.Append($"size {Pick([0.5, 1, 2, 10, 1.5])}\n");
        if (random.Next(3) > 0) text.Append($"time unit {Pick(TimeUnits)}\n");

        var speciesCount = 1 + random.Next(5);
        var species = Enumerable.Range(0, speciesCount).Select(i => $"S{i}").ToList();
        var held = species.Select(_ => random.Next(6) == 0).ToList();
        text.Append("\nspecies\n");
        for (var i = 0; i < speciesCount; i++)
        {
            var amount = random.Next(8) == 0 ? Number(Math.Round(Uniform(0, 40), 3)) : random.Next(0, 40).ToString(CultureInfo.InvariantCulture);
            text.Append($"  {species[i]} = {amount}{(held[i] ? "  held" : "")}\n");
        }

        var parameterCount = 2 + random.Next(5);
        var parameters = new List<string>();
        text.Append("\nparameters\n");
        for (var i = 0; i < parameterCount; i++)
        {
            var name = $"k{i}";
            var value = parameters.Count > 0 && random.Next(4) == 0 ? $"{Number(Math.Round(Uniform(0.5, 2), 2))} * {Pick(parameters)}" : Number(Math.Round(Uniform(0.01, 1.5), 4));
            if (random.Next(10) == 0) value = Number(Uniform(1e-7, 1e-5)); // an e-notation number
            text.Append($"  {name} = {value}\n");
            parameters.Add(name);
        }

        string Species() => Pick(species);
        string K() => Pick(parameters);
        string RateLaw() => random.Next(10) switch
        {
            0 => $"{K()} * hill_act({Species()}, {Number(Math.Round(Uniform(1, 20), 2))}, {Pick([1.0, 2, 3, 1.5])})",
            1 => $"{K()} * hill_rep({Species()}, {K()} * 10, {Pick([1.0, 2, 4, 2.5])})",
            2 => $"{K()} * mm({Species()}, 5) * {Species()}",
            3 => $"{K()} * {Species()} * choose({Species()} > 3, 1, 0.5)",
            4 => $"{K()} * {Species()}^2 / size / 1000",
            5 => $"{K()} + {K()} * ({Species()} > 5 and {Species()} <= 10)",
            6 => $"{K()} * min({Species()}, min({Species()}, 4))",
            7 => $"sqrt({K()} * {Species()}) + {K()} * exp(-{K()} * {Species()})",
            8 => $"{K()} * log(1 + {Species()}) * (not {Species()} == 0)",
            _ => $"{K()} * max({Species()} - 2, 0) + pow({K()}, 2) * ({Species()} != 1 or {Species()} < 3)",
        };
        string Side(int order)
        {
            if (order == 0) return "0";
            var counts = new Dictionary<string, int>();
            for (var q = 0; q < order; q++) { var s = Species(); counts[s] = counts.GetValueOrDefault(s) + 1; }
            return string.Join(" + ", counts.Select(c => c.Value == 1 ? c.Key : $"{c.Value} {c.Key}"));
        }
        string MassConstant() => random.Next(3) == 0 ? $"{K()} * {K()}" : K();

        text.Append("\nreactions\n");
        var reactionCount = 1 + random.Next(6);
        for (var j = 0; j < reactionCount; j++)
        {
            var order = random.Next(4);
            var left = Side(order);
            var right = Side(random.Next(3));
            // Orders 2 and 3 get small constants so the rate equations stay tame.
            var law = random.Next(3) == 0 ? $"rate {RateLaw()}" : $"mass {MassConstant()}{(order >= 2 ? " * 0.001" : "")}";
            var back = random.Next(4) == 0 ? (random.Next(2) == 0 ? $"  back mass {K()}" : $"  back rate {K()} * {Species()}") : "";
            text.Append($"  r{j}: {left} -> {right}  {law}{back}\n");
        }

        // Timed changes may set any species or parameter; a trigger reads one species only it sets.
        var watched = species[random.Next(speciesCount)];
        var settable = species.Where(s => s != watched).ToList();
        var changes = new StringBuilder();
        var timedLines = random.Next(4);
        for (var c = 0; c < timedLines; c++)
        {
            var assignments = new List<string>();
            if (settable.Count > 0 && random.Next(3) > 0)
            {
                var target = Pick(settable);
                assignments.Add(random.Next(4) switch
                {
                    0 => $"{target} += {random.Next(1, 5)}",
                    1 => $"{target} -= {target} / 4",
                    2 => $"{target} = {target} / 2",
                    _ => $"{target} = {random.Next(0, 30)}",
                });
            }
            if (assignments.Count == 0 || random.Next(2) == 0)
            {
                var p = K();
                assignments.Add($"{p} = {p} * {Number(Math.Round(Uniform(0.5, 2), 2))}");
                var q = K();
                if (q != p && random.Next(2) == 0) assignments.Add($"{q} = {p} + {q}");   // reads p as just set
            }
            var timing = random.Next(3) switch
            {
                0 => $"at time {Pick([0.0, 0.5, 1, 2.25, 1.0 / 3])}",
                1 => $"every {Pick([0.5, 0.7, 1.0 / 3])} from {Pick([0.0, 0.25, 1])} until {Pick([2.0, 2.9, 4])}",
                _ => $"every {Pick([0.75, 1.1])} until {Pick([3.0, 5])}",
            };
            changes.Append($"  {string.Join(", ", assignments)}  {timing}\n");
        }
        if (random.Next(2) == 0)
        {
            var condition = random.Next(3) switch
            {
                0 => $"{watched} > {random.Next(5, 30)}",
                1 => $"{watched} >= {random.Next(5, 30)} and size > 0",
                _ => $"not {watched} < {random.Next(5, 30)}",
            };
            var also = settable.Count > 0 && random.Next(2) == 0 ? $", {Pick(settable)} += 1" : "";
            changes.Append($"  {watched} = {random.Next(0, 5)}{also}  whenever {condition}\n");
        }
        if (changes.Length > 0) text.Append("\nchanges\n").Append(changes);

        if (random.Next(3) > 0)
        {
            text.Append("\nreadouts\n");
            text.Append($"  total = {string.Join(" + ", species)}\n");
            if (random.Next(2) == 0) text.Append($"  ratio = {Species()} / (1 + {Species()})\n");
            if (random.Next(2) == 0) text.Append($"  scaled = {K()} * {Species()}\n");
        }
        return text.ToString();
    }
}
