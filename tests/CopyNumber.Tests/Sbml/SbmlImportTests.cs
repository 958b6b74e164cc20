using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Sbml;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Sbml;

public sealed class SbmlImportTests
{
    private static ReactionNetwork Import(string xml)
    {
        var imported = SbmlImporter.Import(xml, "fixture.xml");
        Assert.True(imported.Succeeded, string.Join("\n", imported.Diagnostics.Select(d => d.Format())));
        return Simulate.Network(imported.CnetText!, "fixture.cnet");
    }

    [Fact]
    public void Birth_death_becomes_two_mass_action_reactions_and_its_rate_equation_is_the_exponential()
    {
        var imported = SbmlImporter.Import(SbmlFixtures.BirthDeath(), "bd.xml");
        Assert.Contains("Birth: X -> 2 X  mass Lambda", imported.CnetText);
        Assert.Contains("Death: X -> 0  mass Mu", imported.CnetText);
        var network = Simulate.Network(imported.CnetText!, "bd.cnet");
        Assert.Equal(1, network.Stoichiometry[0, 0]);
        Assert.Equal(-1, network.Stoichiometry[0, 1]);
        // Mean of the linear birth–death process: x0·e^((λ−μ)t) (Bailey 1964, The Elements of Stochastic Processes, ch. 8).
        var solution = Simulate.RateEquations(network, new TimeGrid(10, 5));
        Assert.Equal(100 * Math.Exp(-0.01 * 10), solution[2, 0], 6);
    }

    [Fact]
    public void Birth_death_ensemble_matches_the_closed_form_mean_and_variance()
    {
        var network = Import(SbmlFixtures.BirthDeath());
        const int n = 4000;
        var result = Simulate.Ensemble(network, new EnsembleOptions { Grid = new TimeGrid(5, 5), Replicates = n, Seed = 41 });
        var summary = DistributionSummary.From(result.Histogram(1, 0));
        // Bailey (1964): mean m = x0·e^(rt), variance x0·(λ+μ)/(λ−μ)·e^(rt)(e^(rt) − 1), r = λ − μ.
        double r = -0.01, t = 5;
        var mean = 100 * Math.Exp(r * t);
        var variance = 100 * (0.21 / r) * Math.Exp(r * t) * (Math.Exp(r * t) - 1);
        Assert.InRange(summary.Mean, mean - 4 * Math.Sqrt(variance / n), mean + 4 * Math.Sqrt(variance / n));
        // The sample variance of a near-normal count has standard error σ²·√(2/(n−1)) (common practice).
        Assert.InRange(summary.Variance, variance * (1 - 4 * Math.Sqrt(2.0 / n)), variance * (1 + 4 * Math.Sqrt(2.0 / n)));
    }

    [Fact]
    public void Dimerisation_law_with_a_falling_factorial_stays_a_rate_law_read_as_the_propensity()
    {
        var imported = SbmlImporter.Import(SbmlFixtures.Dimerisation(), "dimer.xml");
        Assert.Contains("Dimerisation: 2 P -> P2  rate k1 * P * (P - 1) / 2", imported.CnetText);
        var network = Simulate.Network(imported.CnetText!, "dimer.cnet");
        Assert.Equal(-2, network.Stoichiometry[0, 0]);
        Assert.Equal(1, network.Stoichiometry[1, 0]);
        // The DSMTS convention (Evans et al. 2008): the law in amounts is the propensity, k1·P(P−1)/2 = 0.001·10·9/2 at P = 10.
        var parameters = network.InitialParameterValues.ToArray();
        var constants = new double[network.Reactions.Count];
        network.Propensities.ComputeConstants(parameters, constants);
        Assert.Equal(0.045, network.Propensities.Evaluate(0, [10, 3], constants, parameters), 12);
        Assert.Equal(0.03, network.Propensities.Evaluate(1, [10, 3], constants, parameters), 12);
    }

    [Fact]
    public void A_species_in_concentration_starts_at_concentration_times_volume_and_decays_at_the_first_order_rate()
    {
        var network = Import(SbmlFixtures.DecayInConcentration());
        Assert.Equal(10, network.InitialAmounts[0]);
        Assert.Equal(2, network.Size);
        // d(amount)/dt = −V·k·(amount/V) = −k·amount: amount 10·e^(−0.3 t) (first-order decay, common practice).
        var solution = Simulate.RateEquations(network, new TimeGrid(4, 2));
        Assert.Equal(10 * Math.Exp(-1.2), solution[2, 0], 6);
    }

    [Fact]
    public void A_timed_event_becomes_a_change_at_its_time_and_a_count_trigger_a_whenever_line()
    {
        var timed = SbmlImporter.Import(SbmlFixtures.BirthDeath(extraEvents: SbmlFixtures.TimedEvent), "e.xml");
        Assert.Contains("X = X / 2  at time 5", timed.CnetText);
        var network = Simulate.Network(timed.CnetText!, "e.cnet");
        var solution = Simulate.RateEquations(network, new TimeGrid(10, 10));
        // Halved at t = 5: 50·e^(−0.01·10) (the exponential mean of Bailey 1964 with the cull applied once).
        Assert.Equal(50 * Math.Exp(-0.1), solution[1, 0], 6);
        var triggered = SbmlImporter.Import(SbmlFixtures.BirthDeath(extraEvents: SbmlFixtures.CountTrigger), "r.xml");
        Assert.Contains("X = 100  whenever X < 50", triggered.CnetText);
    }

    [Fact]
    public void A_rate_rule_is_refused_at_its_element_with_its_variable()
    {
        var xml = SbmlFixtures.BirthDeath(extraRules: SbmlFixtures.RateRule);
        var imported = SbmlImporter.Import(xml, "rr.xml");
        var d = Assert.Single(imported.Diagnostics);
        var line = xml.Split('\n').Select((l, i) => (l, i)).First(x => x.l.Contains("<rateRule")).i + 1;
        Assert.Equal(line, d.Position.Line);
        Assert.Equal(xml.Split('\n')[line - 1].IndexOf("<rateRule", StringComparison.Ordinal) + 1, d.Position.Column);
        Assert.Contains("<rateRule> for 'Lambda' is not supported", d.Message);
    }

    [Theory]
    [InlineData("<reaction id=\"Birth\" reversible=\"false\">", "<reaction id=\"Birth\" reversible=\"false\" fast=\"true\">", "<reaction> 'Birth' is fast")]
    [InlineData("<model id=\"birth_death\">", "<model id=\"birth_death\"><comp:listOfSubmodels xmlns:comp=\"http://www.sbml.org/sbml/level3/version1/comp/version1\"/>", "belongs to an SBML package")]
    [InlineData("<cn>2</cn>", "<cn>2</cn><sin/>", "")]
    public void Unsupported_parts_are_refused_never_translated(string find, string replace, string message)
    {
        var xml = SbmlFixtures.BirthDeath(extraEvents: SbmlFixtures.TimedEvent).Replace(find, replace);
        var imported = SbmlImporter.Import(xml, "x.xml");
        Assert.False(imported.Succeeded);
        Assert.Contains(message, imported.Diagnostics[0].Message);
        Assert.Matches(@"^x\.xml:\d+:\d+: error: ", imported.Diagnostics[0].Format());
    }

    [Fact]
    public void Commands_read_sbml_where_they_read_a_model_and_import_writes_the_translation()
    {
        using var scratch = new ScratchFolder();
        var xml = scratch.File("bd.xml");
        File.WriteAllText(xml, SbmlFixtures.BirthDeath());
        var inspect = CliRun.Of("inspect", xml);
        Assert.Equal(0, inspect.ExitCode);
        Assert.Contains("Birth", inspect.Output);
        var cnet = scratch.File("bd.cnet");
        Assert.Equal(0, CliRun.Of("import", xml, "--out", cnet).ExitCode);
        Assert.StartsWith("# Imported from bd.xml (SBML Level 3 Version 2)", File.ReadAllText(cnet));
        File.WriteAllText(xml, SbmlFixtures.BirthDeath(extraRules: SbmlFixtures.RateRule));
        var refused = CliRun.Of("solve", xml, "--until", "1", "--every", "1");
        Assert.Equal(2, refused.ExitCode);
        Assert.Contains("bd.xml:", refused.Error);
        Assert.Contains("error: <rateRule>", refused.Error);
        Assert.DoesNotContain("   at ", refused.Error);
    }
}
