using System.Net;
using System.Text.Json;
using System.Text.RegularExpressions;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Reports;

/// <summary>
/// The report as a reader sees it (issue 16): report.html of a real run rendered by headless Chromium. A copy of the
/// page gets a small script of ours (its Content-Security-Policy is kept, only inline scripts allowed on top) that, once
/// the page has loaded, writes into the DOM how many images there are, which fail to decode (naturalWidth 0), which
/// elements reach beyond the page's width, and every console error, resource error and policy violation; the test
/// reads that back from --dump-dom. The checks are the HTML standard's (img.complete, naturalWidth; WHATWG HTML) and
/// CSSOM View's (getBoundingClientRect, clientWidth); quoted from memory.
/// </summary>
public sealed class BrowserReportTests
{
    private const string Checker = """
        <script>
        (function () {
          var errors = [];
          var original = console.error;
          console.error = function () { errors.push(Array.prototype.slice.call(arguments).join(' ')); original.apply(console, arguments); };
          window.addEventListener('error', function (e) { errors.push('error: ' + (e.message || (e.target && (e.target.src || e.target.href)) || 'resource')); }, true);
          document.addEventListener('securitypolicyviolation', function (e) { errors.push('policy: ' + e.violatedDirective + ' ' + e.blockedURI); });
          window.addEventListener('load', function () {
            var images = Array.prototype.slice.call(document.images);
            var broken = images.filter(function (i) { return !(i.complete && i.naturalWidth > 0); }).map(function (i) { return i.alt; });
            var width = document.documentElement.clientWidth;
            var over = Array.prototype.slice.call(document.querySelectorAll('body *'))
              .filter(function (el) { return el.getBoundingClientRect().right > width + 0.5; })
              .map(function (el) { return el.tagName + ' right=' + Math.round(el.getBoundingClientRect().right); });
            var out = document.createElement('pre');
            out.id = 'copynumber-check';
            out.textContent = JSON.stringify({ images: images.length, broken: broken, width: width,
              scrollWidth: document.documentElement.scrollWidth, overflow: over.slice(0, 10), errors: errors });
            document.body.appendChild(out);
          });
        })();
        </script>
        """;

    private sealed record Check(int Images, string[] Broken, int Width, int ScrollWidth, string[] Overflow, string[] Errors);

    [BrowserFact]
    public void The_toggle_report_loads_in_chromium_with_every_image_decoded_nothing_too_wide_and_no_errors()
    {
        using var scratch = new ScratchFolder();
        var folder = scratch.File("toggle");
        var run = CliRun.Of("simulate", CliRun.Scenario("toggle_pair.cnet"), "--until", "40", "--every", "1", "--replicates", "300", "--seed", "8",
            "--pair", "U,V", "--out", folder);
        Assert.True(run.ExitCode == 0, run.Error);

        var html = File.ReadAllText(Path.Combine(folder, "report.html"));
        Assert.Contains("default-src 'none'", html);
        var page = Path.Combine(folder, "checked.html");
        File.WriteAllText(page, html
            .Replace("default-src 'none';", "default-src 'none'; script-src 'unsafe-inline';")
            .Replace("<head>\n", "<head>\n" + Checker + "\n"));

        foreach (var width in new[] { 1280, 800 })
        {
            var dom = Browser.Run("--dump-dom", "--virtual-time-budget=20000", $"--window-size={width},900", new Uri(page).AbsoluteUri);
            var match = Regex.Match(dom, "<pre id=\"copynumber-check\">(.*?)</pre>", RegexOptions.Singleline);
            Assert.True(match.Success, $"the check did not run at width {width}; chromium printed: {dom[..Math.Min(dom.Length, 2000)]}");
            var check = JsonSerializer.Deserialize<Check>(WebUtility.HtmlDecode(match.Groups[1].Value), new JsonSerializerOptions { PropertyNameCaseInsensitive = true })!;

            Assert.True(check.Images >= 8, $"only {check.Images} images in the report");
            Assert.Empty(check.Broken);
            Assert.True(check.ScrollWidth <= check.Width, $"the page scrolls sideways at {width}: {check.ScrollWidth} > {check.Width}");
            Assert.Empty(check.Overflow);
            Assert.Empty(check.Errors);
        }
    }
}
