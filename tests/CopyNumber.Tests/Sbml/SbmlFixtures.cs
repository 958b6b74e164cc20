namespace CopyNumber.Tests.Sbml;

/// <summary>
/// SBML encodings, written for these tests, of models of the Discrete Stochastic Models Test Suite
/// (Evans, Gillespie &amp; Wilkinson 2008, Bioinformatics 24:285): the birth–death process and the dimerisation.
/// </summary>
internal static class SbmlFixtures
{
    private const string L3V2 = "http://www.sbml.org/sbml/level3/version2/core";
    private const string MathMl = "http://www.w3.org/1998/Math/MathML";

    /// <summary>Birth–death X → 2X (λX), X → 0 (μX), in amounts (hasOnlySubstanceUnits), X(0) = 100.</summary>
    public static string BirthDeath(double lambda = 0.1, double mu = 0.11, string extraRules = "", string extraEvents = "") => $"""
        <?xml version="1.0" encoding="UTF-8"?>
        <sbml xmlns="{L3V2}" level="3" version="2">
          <model id="birth_death">
            <listOfCompartments>
              <compartment id="Cell" size="1" constant="true"/>
            </listOfCompartments>
            <listOfSpecies>
              <species id="X" compartment="Cell" initialAmount="100" hasOnlySubstanceUnits="true" boundaryCondition="false" constant="false"/>
            </listOfSpecies>
            <listOfParameters>
              <parameter id="Lambda" value="{lambda}" constant="true"/>
              <parameter id="Mu" value="{mu}" constant="true"/>
            </listOfParameters>
            {extraRules}
            <listOfReactions>
              <reaction id="Birth" reversible="false">
                <listOfReactants><speciesReference species="X" stoichiometry="1" constant="true"/></listOfReactants>
                <listOfProducts><speciesReference species="X" stoichiometry="2" constant="true"/></listOfProducts>
                <kineticLaw><math xmlns="{MathMl}"><apply><times/><ci>Lambda</ci><ci>X</ci></apply></math></kineticLaw>
              </reaction>
              <reaction id="Death" reversible="false">
                <listOfReactants><speciesReference species="X" stoichiometry="1" constant="true"/></listOfReactants>
                <kineticLaw><math xmlns="{MathMl}"><apply><times/><ci>Mu</ci><ci>X</ci></apply></math></kineticLaw>
              </reaction>
            </listOfReactions>
            {extraEvents}
          </model>
        </sbml>
        """;

    /// <summary>
    /// Dimerisation 2P → P2 with propensity k1·P(P−1)/2 and P2 → 2P with k2·P2 (Level 2 Version 4, reversible="false"),
    /// P(0) = 100, P2(0) = 0, k1 = 0.001, k2 = 0.01 (the values of the suite's dimerisation model, quoted from memory).
    /// </summary>
    public static string Dimerisation() => $"""
        <?xml version="1.0" encoding="UTF-8"?>
        <sbml xmlns="http://www.sbml.org/sbml/level2/version4" level="2" version="4">
          <model id="dimerisation">
            <listOfCompartments><compartment id="Cell" size="1"/></listOfCompartments>
            <listOfSpecies>
              <species id="P" compartment="Cell" initialAmount="100" hasOnlySubstanceUnits="true"/>
              <species id="P2" compartment="Cell" initialAmount="0" hasOnlySubstanceUnits="true"/>
            </listOfSpecies>
            <listOfParameters>
              <parameter id="k1" value="0.001"/>
              <parameter id="k2" value="0.01"/>
            </listOfParameters>
            <listOfReactions>
              <reaction id="Dimerisation" reversible="false">
                <listOfReactants><speciesReference species="P" stoichiometry="2"/></listOfReactants>
                <listOfProducts><speciesReference species="P2"/></listOfProducts>
                <kineticLaw><math xmlns="{MathMl}">
                  <apply><divide/><apply><times/><ci>k1</ci><ci>P</ci><apply><minus/><ci>P</ci><cn type="integer">1</cn></apply></apply><cn>2</cn></apply>
                </math></kineticLaw>
              </reaction>
              <reaction id="Dissociation" reversible="false">
                <listOfReactants><speciesReference species="P2"/></listOfReactants>
                <listOfProducts><speciesReference species="P" stoichiometry="2"/></listOfProducts>
                <kineticLaw><math xmlns="{MathMl}"><apply><times/><ci>k2</ci><ci>P2</ci></apply></math></kineticLaw>
              </reaction>
            </listOfReactions>
          </model>
        </sbml>
        """;

    /// <summary>S → 0 with law V·k·[S] on concentrations (hasOnlySubstanceUnits false), V = 2, [S](0) = 5: amount 10.</summary>
    public static string DecayInConcentration() => $"""
        <?xml version="1.0" encoding="UTF-8"?>
        <sbml xmlns="{L3V2}" level="3" version="2">
          <model id="decay">
            <listOfCompartments><compartment id="V" size="2" constant="true"/></listOfCompartments>
            <listOfSpecies>
              <species id="S" compartment="V" initialConcentration="5" hasOnlySubstanceUnits="false" boundaryCondition="false" constant="false"/>
            </listOfSpecies>
            <listOfParameters><parameter id="k" value="0.3" constant="true"/></listOfParameters>
            <listOfReactions>
              <reaction id="decay" reversible="false">
                <listOfReactants><speciesReference species="S" stoichiometry="1" constant="true"/></listOfReactants>
                <kineticLaw><math xmlns="{MathMl}"><apply><times/><ci>V</ci><ci>k</ci><ci>S</ci></apply></math></kineticLaw>
              </reaction>
            </listOfReactions>
          </model>
        </sbml>
        """;

    public const string RateRule = $"""
            <listOfRules>
              <rateRule variable="Lambda"><math xmlns="{MathMl}"><cn>0</cn></math></rateRule>
            </listOfRules>
        """;

    public const string TimedEvent = $"""
            <listOfEvents>
              <event id="cull" useValuesFromTriggerTime="true">
                <trigger initialValue="true" persistent="true"><math xmlns="{MathMl}">
                  <apply><geq/><csymbol encoding="text" definitionURL="http://www.sbml.org/sbml/symbols/time">t</csymbol><cn>5</cn></apply>
                </math></trigger>
                <listOfEventAssignments>
                  <eventAssignment variable="X"><math xmlns="{MathMl}"><apply><divide/><ci>X</ci><cn>2</cn></apply></math></eventAssignment>
                </listOfEventAssignments>
              </event>
            </listOfEvents>
        """;

    public const string CountTrigger = $"""
            <listOfEvents>
              <event id="reset" useValuesFromTriggerTime="true">
                <trigger initialValue="true" persistent="true"><math xmlns="{MathMl}">
                  <apply><lt/><ci>X</ci><cn>50</cn></apply>
                </math></trigger>
                <listOfEventAssignments>
                  <eventAssignment variable="X"><math xmlns="{MathMl}"><cn>100</cn></math></eventAssignment>
                </listOfEventAssignments>
              </event>
            </listOfEvents>
        """;
}
