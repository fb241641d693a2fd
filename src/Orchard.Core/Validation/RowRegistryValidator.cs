using Orchard.Core.Model;

namespace Orchard.Core.Validation;

/// <summary>
/// Checks a row registry and reports every problem at once with its JSON path. Every row must end up with
/// a length, tree spacing, row spacing, alley width and sides, given on the row or on its block. Block and
/// row ids are the names scans give (<c>block</c>, <c>row</c>): free text held to the same rule as there (no
/// control or invisible formatting characters, no padding), not the id pattern. Never throws, including on
/// nulls a JSON reader leaves for missing fields.
/// </summary>
public static class RowRegistryValidator
{
    public const int MaxBlocks = 500;
    public const int MaxRows = 5000;
    public const int MaxIdLength = 64;

    /// <summary>
    /// Usual ranges (warnings outside, common practice): trees 0.3–8 m apart in the row (super-spindle to
    /// standard trees), rows 1.5–10 m apart.
    /// </summary>
    private const double MinUsualTreeSpacingM = 0.3, MaxUsualTreeSpacingM = 8, MinUsualRowSpacingM = 1.5, MaxUsualRowSpacingM = 10;

    public static ValidationReport Validate(RowRegistry? registry)
    {
        var problems = new ProblemCollector();
        if (registry is null)
        {
            problems.Error("$", "document.missing", "A row registry is required.");
            return problems.ToReport();
        }

        if (!problems.Present(registry.Blocks, "$.blocks"))
        {
            return problems.ToReport();
        }

        if (registry.Blocks.Count > MaxBlocks)
        {
            problems.Error("$.blocks", "blocks.tooMany", $"At most {MaxBlocks} blocks; there are {registry.Blocks.Count}.");
            return problems.ToReport();
        }

        var rowTotal = registry.Blocks.Sum(b => b?.Rows?.Count ?? 0);
        if (rowTotal > MaxRows)
        {
            problems.Error("$.blocks", "rows.tooMany", $"At most {MaxRows} rows in all; there are {rowTotal}.");
            return problems.ToReport();
        }

        var blockIds = new Dictionary<string, int>(StringComparer.Ordinal);
        for (var b = 0; b < registry.Blocks.Count; b++)
        {
            var path = $"$.blocks[{b}]";
            var block = registry.Blocks[b];
            if (!problems.Present(block, path))
            {
                continue;
            }

            if (problems.Label(block.Id, MaxIdLength, path + ".id") && !blockIds.TryAdd(block.Id, b))
            {
                problems.Error(path + ".id", "id.duplicate", $"Block '{block.Id}' is already listed at $.blocks[{blockIds[block.Id]}].");
            }

            CheckValues(path, block.LengthM, block.TreeSpacingM, block.RowSpacingM, block.AlleyWidthM, block.Sides, problems);
            if (!problems.Present(block.Rows, path + ".rows"))
            {
                continue;
            }

            var rowIds = new Dictionary<string, int>(StringComparer.Ordinal);
            for (var r = 0; r < block.Rows.Count; r++)
            {
                var rowPath = $"{path}.rows[{r}]";
                var row = block.Rows[r];
                if (!problems.Present(row, rowPath))
                {
                    continue;
                }

                if (problems.Label(row.Id, MaxIdLength, rowPath + ".id") && !rowIds.TryAdd(row.Id, r))
                {
                    problems.Error(rowPath + ".id", "id.duplicate", $"Row '{row.Id}' is already listed at {path}.rows[{rowIds[row.Id]}].");
                }

                CheckValues(rowPath, row.LengthM, row.TreeSpacingM, row.RowSpacingM, row.AlleyWidthM, row.Sides, problems);
                CheckRow(rowPath, block, row, problems);
            }
        }

        return problems.ToReport();
    }

    /// <summary>The ranges of whatever values are given, on a block or a row.</summary>
    private static void CheckValues(string path, double? lengthM, double? treeSpacingM, double? rowSpacingM, double? alleyWidthM, RowSides? sides, ProblemCollector problems)
    {
        if (lengthM is { } length)
        {
            problems.Positive(length, 10_000, path + ".lengthM", "row.length", "A row length");
        }

        if (treeSpacingM is { } tree && problems.Positive(tree, 50, path + ".treeSpacingM", "row.treeSpacing", "A tree spacing")
            && tree is < MinUsualTreeSpacingM or > MaxUsualTreeSpacingM)
        {
            problems.Warning(path + ".treeSpacingM", "row.treeSpacingUnusual", $"{tree:G} m between trees is outside the usual {MinUsualTreeSpacingM:G}–{MaxUsualTreeSpacingM:G} m.");
        }

        if (rowSpacingM is { } rows && problems.Positive(rows, 50, path + ".rowSpacingM", "row.rowSpacing", "A row spacing")
            && rows is < MinUsualRowSpacingM or > MaxUsualRowSpacingM)
        {
            problems.Warning(path + ".rowSpacingM", "row.rowSpacingUnusual", $"{rows:G} m between rows is outside the usual {MinUsualRowSpacingM:G}–{MaxUsualRowSpacingM:G} m.");
        }

        if (alleyWidthM is { } alley)
        {
            problems.Positive(alley, 50, path + ".alleyWidthM", "row.alleyWidth", "An alley width");
        }

        if (sides is { } s && !Enum.IsDefined(s))
        {
            problems.Error(path + ".sides", "enum.unknown", "Must be one of: both, near.");
        }
    }

    /// <summary>What the row ends up with: every value present, the alley within the row spacing, the tree count plausible.</summary>
    private static void CheckRow(string path, RegistryBlock block, RegistryRow row, ProblemCollector problems)
    {
        var length = Required(row.LengthM ?? block.LengthM, path + ".lengthM", problems);
        var tree = Required(row.TreeSpacingM ?? block.TreeSpacingM, path + ".treeSpacingM", problems);
        var rows = Required(row.RowSpacingM ?? block.RowSpacingM, path + ".rowSpacingM", problems);
        var alley = Required(row.AlleyWidthM ?? block.AlleyWidthM, path + ".alleyWidthM", problems);
        if ((row.Sides ?? block.Sides) is null)
        {
            problems.Error(path + ".sides", "field.missing", "Required on the row or on its block: both or near.");
        }

        if (alley is { } a && rows is { } r && a > 0 && r > 0 && a > r)
        {
            problems.Error(path + ".alleyWidthM", "row.alleyWiderThanRowSpacing", $"An alley of {a:G} m does not fit between rows {r:G} m apart.");
        }

        if (row.TreeCount is { } count)
        {
            if (count is < 0 or > 100_000)
            {
                problems.Error(path + ".treeCount", "row.treeCount", $"Must be between 0 and 100000; it is {count}.");
            }
            else if (length is { } l && tree is { } t && l > 0 && t > 0 && double.IsFinite(l / t) && count > Math.Floor(l / t) + 1)
            {
                problems.Warning(path + ".treeCount", "row.treeCountAboveFit", $"{count} trees {t:G} m apart need more than the row's {l:G} m.");
            }
        }
    }

    private static double? Required(double? value, string path, ProblemCollector problems)
    {
        if (value is null)
        {
            problems.Error(path, "field.missing", "Required on the row or on its block.");
        }

        return value;
    }
}
