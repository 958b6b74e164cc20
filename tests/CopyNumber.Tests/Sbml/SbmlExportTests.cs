using System.Xml.Linq;
using CopyNumber.Network;
using CopyNumber.Sbml;
using CopyNumber.Tests.Cli;

namespace CopyNumber.Tests.Sbml;

public sealed class SbmlExportTests
{
    private static readonly XNamespace Core = "http://www.sbml.org/sbml/level3/version2/core";

    [Theory]
    [MemberData(nameof(CliRun.ScenarioNames), MemberType = typeof(CliRun))]
    public void Every_bundled_scenario_survives_export_and_import_as_the_same_network(string scenario)
    {
        var loaded = ModelLoader.Load(CliRun.Scenario(scenario));
        Assert.NotNull(loaded.Model);
        var network = loaded.Model!.Network;
        if (network.Bursts.Any || network.Variability.Any)
        {
            // Bursts and per-cell parameters are refused by name (What_has_no_SBML_form_yet_is_refused_at_its_line).
            var refused = SbmlExporter.Export(loaded.Model!);
            Assert.False(refused.Succeeded);
            Assert.NotEmpty(refused.Diagnostics);
            return;
        }
        var (original, back, export) = NetworkEquivalence.RoundTrip(loaded.Model!);
        NetworkEquivalence.AssertSame(original.Network, back.Network, export, seed: 7);
    }

    [Fact]
    public void Random_models_survive_export_and_import_as_the_same_network()
    {
        var random = new Random(20_261_202);
        var features = new HashSet<string>();
        var solved = 0;
        const int models = 150;
        for (var model = 0; model < models; model++)
        {
            var text = RandomNetworks.Generate(random);
            var (original, back, export) = NetworkEquivalence.RoundTrip(text, $"random{model}.cnet");
            if (NetworkEquivalence.AssertSame(original.Network, back.Network, export, seed: model)) solved++;
            foreach (var word in new[] { "hill_act", "hill_rep", "mm(", "every", "at time", "whenever", "back", "held", "readouts", "3 S", "E-0" })
                if (text.Contains(word)) features.Add(word);
            if (original.Network.Reactions.Any(r => r.Reactants.Sum(x => x.Coefficient) == 3 && r.Law == CopyNumber.Language.LawKind.Mass)) features.Add("order 3");
            if (original.Network.Reactions.Any(r => r.Reactants.Count == 0 && r.Law == CopyNumber.Language.LawKind.Mass)) features.Add("order 0");
        }
        // The generator reached every form it is meant to cover, and most models' rate equations stay finite.
        Assert.True(features.Count == 13, "reached only: " + string.Join(", ", features));
        Assert.True(solved >= models * 3 / 4, $"only {solved} of {models} random models could be solved");
    }

    [Fact]
    public void A_mass_action_law_is_written_as_the_propensity_in_molecule_counts()
    {
        // 2 A -> B mass k at size Ω: a = k·A(A−1)/Ω (docs/conventions.md; Gillespie 1977, J. Phys. Chem. 81:2340,
        // counts distinct pairs as A(A−1)/2, absorbed into k here). At k = 0.3, Ω = 2, A = 7: 0.3·7·6/2 = 6.3.
        var model = ModelLoader.LoadText("size 2\nspecies\n  A = 7\n  B = 0\nparameters\n  k = 0.3\nreactions\n  pair: 2 A -> B  mass k\n", "pair.cnet").Model!;
        var xml = SbmlExporter.Export(model).Xml!;
        var law = XDocument.Parse(xml).Descendants(Core + "kineticLaw").Single().Elements().Last();
        var text = string.Concat(law.Descendants().Where(e => !e.HasElements).Select(e => e.Name.LocalName + ":" + e.Value + " "));
        Assert.Equal("times: times: times: k power: size cn:-1 A minus: A cn:1 ", text.Replace("ci:", ""));
        // Its value, read back through the importer's translation as a rate law (no annotation), is that number.
        var plain = xml.Replace("massAction", "somethingElse");
        var network = Simulate.Network(SbmlImporter.Import(plain, "pair.xml").CnetText!, "pair.cnet");
        var constants = new double[1];
        network.Propensities.ComputeConstants([0.3], constants);
        Assert.Equal(6.3, network.Propensities.Evaluate(0, [7, 0], constants, [0.3]), 12);
        Assert.Equal(CopyNumber.Language.LawKind.Rate, network.Reactions[0].Law);
    }

    [Fact]
    public void A_mass_action_annotation_beside_another_law_is_not_believed()
    {
        // The law k·A·A/Ω (not the falling factorial) under an annotation saying 'mass k': the law is read as written,
        // so its propensity at A = 7 stays 0.3·49/2 = 7.35 (annotations never change a model's meaning, L3V2 core section 3.2.4).
        var model = ModelLoader.LoadText("size 2\nspecies\n  A = 7\n  B = 0\nparameters\n  k = 0.3\nreactions\n  pair: 2 A -> B  mass k\n", "pair.cnet").Model!;
        var document = XDocument.Parse(SbmlExporter.Export(model).Xml!);
        var law = document.Descendants(Core + "kineticLaw").Single().Elements().Last();
        var minus = law.Descendants().Single(e => e.Name.LocalName == "minus").Parent!;
        minus.ReplaceWith(minus.Elements().ElementAt(1));   // A − 1 becomes A
        var imported = SbmlImporter.Import(document.ToString(), "tampered.xml");
        Assert.True(imported.Succeeded, string.Join("\n", imported.Diagnostics.Select(d => d.Format())));
        var network = Simulate.Network(imported.CnetText!, "tampered.cnet");
        Assert.Equal(CopyNumber.Language.LawKind.Rate, network.Reactions[0].Law);
        var constants = new double[1];
        network.Propensities.ComputeConstants([0.3], constants);
        Assert.Equal(7.35, network.Propensities.Evaluate(0, [7, 0], constants, [0.3]), 12);
    }

    [Fact]
    public void Exported_birth_death_solves_to_the_closed_form_mean()
    {
        var model = ModelLoader.LoadText("time unit minute\nspecies\n  X = 100\nparameters\n  l = 0.1\n  m = 0.11\nreactions\n  birth: X -> 2 X  mass l\n  death: X -> 0  mass m\n", "bd.cnet").Model!;
        var (_, back, _) = NetworkEquivalence.RoundTrip(model);
        var solution = Simulate.RateEquations(back.Network, new TimeGrid(10, 5));
        // Mean of the linear birth–death process: x0·e^((λ−μ)t) (Bailey 1964, The Elements of Stochastic Processes, ch. 8).
        Assert.Equal(100 * Math.Exp(-0.01 * 10), solution[2, 0], 6);
        Assert.Equal("minute", back.Network.Units.Time);
    }

    [Fact]
    public void Names_that_clash_in_the_shared_SBML_namespace_are_renamed_and_stated_in_the_notes()
    {
        var model = ModelLoader.LoadText("species\n  A = 5\nparameters\n  k = 1\nreactions\n  A: A -> 0  mass k\n", "clash.cnet").Model!;
        var (original, back, export) = NetworkEquivalence.RoundTrip(model);
        Assert.Equal("A_2", export.RenamedReactions["A"]);
        Assert.Empty(export.Renamed);
        Assert.Contains("reaction 'A' is 'A_2'", export.Xml);
        NetworkEquivalence.AssertSame(original.Network, back.Network, export, seed: 3);
    }

    [Theory]
    [InlineData("  A += 1  every 2\n", "without 'until'")]
    [InlineData("  A += 1  every 0.001 until 100\n", "at most 10,000")]
    [InlineData("  A = 3, B = A  at time 1\n", "reads species 'A', set earlier on this line")]
    [InlineData("  A = 3, A = 4  at time 1\n", "changed twice")]
    [InlineData("  A = 0  at time 2\n  B = 0  whenever A > 4\n", "reads 'A', which the change on line 10 sets")]
    public void What_SBML_core_cannot_carry_exactly_is_refused_at_its_line(string changes, string expected)
    {
        var text = "species\n  A = 5\n  B = 1\nparameters\n  k = 1\nreactions\n  d: A -> B  mass k\n\nchanges\n" + changes;
        var model = ModelLoader.LoadText(text, "refused.cnet");
        Assert.True(model.Model is not null, string.Join("\n", model.Diagnostics.Select(d => d.Format())));
        var export = SbmlExporter.Export(model.Model!);
        Assert.False(export.Succeeded);
        Assert.Null(export.Xml);
        var diagnostic = Assert.Single(export.Diagnostics);
        Assert.Contains(expected, diagnostic.Message);
        Assert.StartsWith("refused.cnet:1", diagnostic.Format());
    }

    /// <summary>
    /// What SBML core has no form for (a random burst size, a parameter drawn per cell) is refused where it is written:
    /// an export is only written when importing it gives the same network (the round-trip rule). Before, an
    /// export of such a model stopped with a crash.
    /// </summary>
    [Theory]
    [InlineData("parameters\n  k = 2  varies gamma cv 0.3\nreactions\n  make: 0 -> A  mass k\n  d: A -> 0  mass 1\n", "refused.cnet:4:3", "varies from cell to cell")]
    [InlineData("parameters\n  k = 2\nreactions\n  make: 0 -> burst(3) A  mass k\n  d: A -> 0  mass 1\n", "refused.cnet:6:23", "bursts of random size")]
    public void What_has_no_SBML_form_yet_is_refused_at_its_line(string rest, string at, string expected)
    {
        var model = ModelLoader.LoadText("species\n  A = 0\n" + rest, "refused.cnet");
        Assert.True(model.Model is not null, string.Join("\n", model.Diagnostics.Select(d => d.Format())));
        var export = SbmlExporter.Export(model.Model!);
        Assert.False(export.Succeeded);
        Assert.Null(export.Xml);
        Assert.Contains(export.Diagnostics, d => d.Message.Contains(expected, StringComparison.Ordinal) && d.Format().StartsWith(at, StringComparison.Ordinal));
    }

    /// <summary>
    /// A rate law that reads time, with sin and cos, goes out as SBML's time csymbol and &lt;sin/&gt;, &lt;cos/&gt;
    /// and comes back as the same network (SBML L3V2 core, Hucka et al. 2019, §3.4.6 on the time symbol; before, the
    /// export crashed on 'time' and the import refused it). The rate equations' solution is compared by AssertSame.
    /// </summary>
    [Fact]
    public void A_law_that_reads_time_survives_export_and_import()
    {
        var model = ModelLoader.LoadText("species\n  A = 0\nparameters\n  k = 2\n  w = 0.5\nreactions\n  make: 0 -> A  rate k * (1 + 0.5 * sin(w * time) * cos(time / 3))\n  d: A -> 0  mass 1\n", "periodic.cnet").Model!;
        var (original, back, export) = NetworkEquivalence.RoundTrip(model);
        Assert.Contains("/time", export.Xml);
        Assert.True(back.Network.TimeDependence.Any);
        NetworkEquivalence.AssertSame(original.Network, back.Network, export, seed: 11);
    }

    [Fact]
    public void Changes_at_one_instant_keep_their_file_order_through_event_priorities()
    {
        // Order matters: doubled then raised by 3 is 2·5 + 3 = 13; the other order gives 16.
        var text = "species\n  A = 5\nparameters\n  k = 1\nreactions\n  d: A -> 0  mass k\nchanges\n  A = A * 2  at time 1\n  A += 3  at time 1\n";
        var (original, back, export) = NetworkEquivalence.RoundTrip(text);
        var priorities = XDocument.Parse(export.Xml!).Descendants(Core + "priority").Select(p => double.Parse(p.Value)).ToList();
        Assert.Equal([2.0, 1.0], priorities);
        var state = new long[] { 5 };
        foreach (var change in back.Network.Schedule)
            state[0] = change.Combine(state[0], (long)Math.Round(change.OnCounts(state, [1.0]), MidpointRounding.AwayFromZero));
        Assert.Equal(13, state[0]);
        NetworkEquivalence.AssertSame(original.Network, back.Network, export, seed: 5);
    }

    [Fact]
    public void Import_orders_events_by_decreasing_priority()
    {
        // SBML L3V2 core section 4.12.6: of simultaneous events, the one with the higher priority executes first.
        var events = """
            <listOfEvents>
              <event useValuesFromTriggerTime="false"><trigger initialValue="true" persistent="true"><math xmlns="http://www.w3.org/1998/Math/MathML"><apply><geq/><csymbol encoding="text" definitionURL="http://www.sbml.org/sbml/symbols/time">t</csymbol><cn>5</cn></apply></math></trigger>
                <priority><math xmlns="http://www.w3.org/1998/Math/MathML"><cn>1</cn></math></priority>
                <listOfEventAssignments><eventAssignment variable="X"><math xmlns="http://www.w3.org/1998/Math/MathML"><apply><plus/><ci>X</ci><cn>3</cn></apply></math></eventAssignment></listOfEventAssignments></event>
              <event useValuesFromTriggerTime="false"><trigger initialValue="true" persistent="true"><math xmlns="http://www.w3.org/1998/Math/MathML"><apply><geq/><csymbol encoding="text" definitionURL="http://www.sbml.org/sbml/symbols/time">t</csymbol><cn>5</cn></apply></math></trigger>
                <priority><math xmlns="http://www.w3.org/1998/Math/MathML"><cn>2</cn></math></priority>
                <listOfEventAssignments><eventAssignment variable="X"><math xmlns="http://www.w3.org/1998/Math/MathML"><apply><times/><ci>X</ci><cn>2</cn></apply></math></eventAssignment></listOfEventAssignments></event>
            </listOfEvents>
            """;
        var imported = SbmlImporter.Import(SbmlFixtures.BirthDeath(extraEvents: events), "priorities.xml");
        Assert.True(imported.Succeeded, string.Join("\n", imported.Diagnostics.Select(d => d.Format())));
        var changes = imported.CnetText!.Split('\n').Where(l => l.Contains("at time")).Select(l => l.Trim()).ToList();
        Assert.Equal(["X = X * 2  at time 5", "X = X + 3  at time 5"], changes);
    }

    [Fact]
    public void An_e_notation_number_is_read_as_the_nearest_double()
    {
        // 1.1 × 10^-12 computed as a product is 1.1000000000000002e-12; the decimal 1.1e-12 is the nearest double (IEEE 754, common practice).
        var value = 1.1e-12;
        Assert.NotEqual(value, 1.1 * Math.Pow(10, -12));
        var rule = $"""<listOfRules><assignmentRule variable="Tiny"><math xmlns="http://www.w3.org/1998/Math/MathML"><cn type="e-notation">1.1<sep/>-12</cn></math></assignmentRule></listOfRules>""";
        var xml = SbmlFixtures.BirthDeath(extraRules: rule).Replace("<parameter id=\"Mu\"", "<parameter id=\"Tiny\" constant=\"false\"/><parameter id=\"Mu\"");
        var imported = SbmlImporter.Import(xml, "tiny.xml");
        Assert.True(imported.Succeeded, string.Join("\n", imported.Diagnostics.Select(d => d.Format())));
        Assert.Contains("Tiny = 1.1e-12", imported.CnetText); // the language writes numbers as ExpressionText.Format does
    }

    [DsmtsFolderFact]
    public void Every_imported_DSMTS_model_survives_export_and_import_as_the_same_network()
    {
        var cases = Directory.GetDirectories(Path.Combine(DsmtsFolderFactAttribute.Folder, "stochastic")).Order(StringComparer.Ordinal).ToList();
        var compared = 0;
        foreach (var folder in cases)
        {
            var id = Path.GetFileName(folder);
            var file = Path.Combine(folder, $"{id}-sbml-l3v2.xml");
            if (!File.Exists(file)) continue;
            var loaded = ModelLoader.Load(file);
            if (loaded.Model is null) continue;   // refused by the importer itself (distrib package): nothing to export
            var (original, back, export) = NetworkEquivalence.RoundTrip(loaded.Model);
            NetworkEquivalence.AssertSame(original.Network, back.Network, export, seed: compared, solve: true);
            compared++;
        }
        // DSMTS models 00001–00039 import (docs/sbml.md); each must also export and come back.
        Assert.Equal(39, compared);
    }
}

/// <summary>A fact that runs when the SBML Test Suite is at ../shared/sbml-test-cases and says it was skipped otherwise.</summary>
public sealed class DsmtsFolderFactAttribute : FactAttribute
{
    /// <summary>../shared/sbml-test-cases beside the repository root (the folder holding CopyNumber.sln), as in CI.</summary>
    public static string Folder
    {
        get
        {
            var directory = new DirectoryInfo(AppContext.BaseDirectory);
            while (directory is not null && !File.Exists(Path.Combine(directory.FullName, "CopyNumber.sln"))) directory = directory.Parent;
            return Path.GetFullPath(Path.Combine(directory?.FullName ?? ".", "..", "shared", "sbml-test-cases"));
        }
    }

    public DsmtsFolderFactAttribute()
    {
        if (!Directory.Exists(Path.Combine(Folder, "stochastic")))
            Skip = $"the SBML Test Suite is not at {Folder}; this check runs when it is";
    }
}
