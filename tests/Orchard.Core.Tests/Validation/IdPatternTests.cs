using Orchard.Core.Validation;

namespace Orchard.Core.Tests.Validation;

/// <summary>
/// Ids follow one pattern, so two spellings of one id, or an id that cannot be addressed, never get in.
/// The look-alike cases are the standard Unicode ones: the bidi override U+202E and zero-width space
/// U+200B (Unicode category Cf), a decomposed "e + U+0301 COMBINING ACUTE" against the composed U+00E9
/// (the NFC/NFD pair of UAX #15's canonical equivalence), and padding with spaces.
/// </summary>
public sealed class IdPatternTests
{
    [Theory]
    [InlineData("K1-001")]
    [InlineData("c01")]
    [InlineData("demo-arm-6dof")]
    [InlineData("a.b_c-D9")]
    [InlineData("x")]
    [InlineData("..a")]
    public void Plain_ids_pass(string id) => Assert.True(IdPattern.IsValid(id));

    [Theory]
    [InlineData("")]
    [InlineData(".")]
    [InlineData("..")]
    [InlineData("a/b")]
    [InlineData("a%2Fb")]
    [InlineData(" K1-001")]
    [InlineData("K1-001 ")]
    [InlineData("K1 001")]
    [InlineData("\u202Eevil")]
    [InlineData("c\u200B01")]
    [InlineData("caf\u00E9")]
    [InlineData("cafe\u0301")]
    [InlineData("\uFF2B1")]
    [InlineData("tab\there")]
    public void Look_alikes_and_unaddressable_ids_are_refused(string id) => Assert.False(IdPattern.IsValid(id));

    [Fact]
    public void Sixty_four_characters_pass_and_sixty_five_do_not()
    {
        Assert.True(IdPattern.IsValid(new string('a', 64)));
        Assert.False(IdPattern.IsValid(new string('a', 65)));
    }

    [Fact]
    public void The_validator_names_the_pattern_at_each_bad_id_and_keeps_labels_free_text()
    {
        var scan = SampleScans.Valid() with { TreeId = "\u202Etree", Block = "Kestrel Terrace", Row = "Row 3" };
        scan = scan.WithCut(0, c => c with { Id = "cafe\u0301" });
        var report = TreeScanValidator.Validate(scan);
        var tree = Assert.Single(report.Errors, e => e.Path == "$.treeId");
        Assert.Equal("id.pattern", tree.Code);
        Assert.Contains(IdPattern.Expression, tree.Message, StringComparison.Ordinal);
        Assert.Contains("\\u202E", tree.Message, StringComparison.Ordinal);
        Assert.Contains(report.Errors, e => e is { Path: "$.cuts[0].id", Code: "id.pattern" });
        Assert.DoesNotContain(report.Errors, e => e.Path is "$.block" or "$.row");
    }

    [Fact]
    public void Labels_refuse_invisible_formatting_and_padding()
    {
        var report = TreeScanValidator.Validate(SampleScans.Valid() with { Block = "Kestrel\u200BTerrace", Row = " Row 3" });
        Assert.Contains(report.Errors, e => e is { Path: "$.block", Code: "id.formatCharacter" });
        Assert.Contains(report.Errors, e => e is { Path: "$.row", Code: "id.padded" });
    }
}
