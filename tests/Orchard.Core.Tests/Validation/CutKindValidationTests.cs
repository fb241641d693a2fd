using Orchard.Core.Model;
using Orchard.Core.Validation;

namespace Orchard.Core.Tests.Validation;

/// <summary>The fields of the cut back and renewal kinds, on the sample scan (see <see cref="SampleScans"/>).</summary>
public sealed class CutKindValidationTests
{
    private static ValidationReport With(Cut cut) => TreeScanValidator.Validate(SampleScans.Valid().WithCut(1, _ => cut));

    [Fact]
    public void A_well_formed_renewal_cut_and_cut_back_are_valid_without_warnings()
    {
        var scan = SampleScans.Valid() with
        {
            Cuts =
            [
                new Cut("c1", "b2", 0, CutKind.Renewal, 11.5, StubLengthM: 0.02),
                new Cut("c2", "b1", 0, CutKind.CutBack, 29.8, BackToBranchId: "b2"),
            ],
        };

        var report = TreeScanValidator.Validate(scan);

        Assert.True(report.IsValid, string.Join("; ", report.Problems));
        Assert.Empty(report.Warnings);
    }

    [Theory]
    [InlineData(null, "$.cuts[1].stubLengthM", "field.missing")]
    [InlineData(-0.01, "$.cuts[1].stubLengthM", "cut.stubNotPositive")]
    [InlineData(0.45, "$.cuts[1].stubLengthM", "cut.beyondBranch")]
    public void A_renewal_cut_needs_a_positive_stub_that_fits_on_its_branch(double? stubM, string path, string code)
    {
        var report = With(new Cut("c2", "b2", 0, CutKind.Renewal, 11.5, StubLengthM: stubM));

        Assert.Contains(report.Errors, e => e.Path == path && e.Code == code);
    }

    [Fact]
    public void An_unusually_long_stub_is_a_warning()
    {
        var report = With(new Cut("c2", "b2", 0, CutKind.Renewal, 11.5, StubLengthM: 0.12));

        Assert.True(report.IsValid);
        Assert.Contains(report.Warnings, w => w.Path == "$.cuts[1].stubLengthM" && w.Code == "cut.stubUnusual");
    }

    [Theory]
    [InlineData(null, "field.missing")]
    [InlineData("b9", "reference.missingBranch")]
    [InlineData("b1", "cut.backToItself")]
    [InlineData("b0", "cut.sideBranchElsewhere")]
    public void A_cut_back_names_a_side_branch_growing_where_the_shortened_branch_starts(string? side, string code)
    {
        var report = With(new Cut("c2", "b1", 0, CutKind.CutBack, 29.8, BackToBranchId: side));

        Assert.Contains(report.Errors, e => e.Path == "$.cuts[1].backToBranchId" && e.Code == code);
    }

    [Fact]
    public void A_side_branch_under_a_third_of_the_wood_cut_back_to_it_is_a_warning()
    {
        // b2 is 12 mm at its base; cutting back 40 mm of wood to it breaks the one-third rule (12 < 13.3).
        var report = With(new Cut("c2", "b1", 0, CutKind.CutBack, 40, BackToBranchId: "b2"));

        Assert.True(report.IsValid);
        Assert.Contains(report.Warnings, w => w.Code == "cut.sideBranchThin");
    }

    [Fact]
    public void Fields_of_one_kind_are_refused_on_another()
    {
        var report = With(new Cut("c2", "b1", 0.5, CutKind.Heading, 20, StubLengthM: 0.02, BackToBranchId: "b2"));

        Assert.Contains(report.Errors, e => e.Path == "$.cuts[1].stubLengthM" && e.Code == "cut.fieldNotForKind");
        Assert.Contains(report.Errors, e => e.Path == "$.cuts[1].backToBranchId" && e.Code == "cut.fieldNotForKind");
    }

    [Fact]
    public void A_position_given_for_a_placed_kind_that_disagrees_is_a_warning_and_one_that_agrees_is_not()
    {
        var far = With(new Cut("c2", "b2", 0.5, CutKind.Renewal, 11.5, StubLengthM: 0.02));
        Assert.Contains(far.Warnings, w => w.Path == "$.cuts[1].positionAlong" && w.Code == "cut.positionFromKind");

        // 0.035 m out along the 0.4123 m branch: 0.0849.
        var near = With(new Cut("c2", "b2", 0.085, CutKind.Renewal, 11.5, StubLengthM: 0.02));
        Assert.DoesNotContain(near.Warnings, w => w.Code == "cut.positionFromKind");
    }
}
