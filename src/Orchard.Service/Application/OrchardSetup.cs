using Orchard.Core.Estimates;
using Orchard.Core.Model;
using Orchard.Core.Serialization;
using Orchard.Core.Validation;
using Orchard.Store;

namespace Orchard.Service.Application;

/// <summary>
/// The orchard's own documents: the row registry (an admin writes it) and the reference rates (a manager
/// keeps them, with a key or from the review page's form). Read strictly, validated, stored and audited as
/// the caller's; what the estimates are computed from besides the trees.
/// </summary>
public sealed class OrchardSetup(IOrchardStore store)
{
    /// <summary>Replaces the row registry; 200 with its size and warnings, 400/422 naming each bad field.</summary>
    public async Task<IntakeAnswer> PutRowsAsync(ReadOnlyMemory<byte> body, Caller caller, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(caller);
        var (registry, unreadable) = DocumentReader.Read<RowRegistry>(body);
        if (registry is null)
        {
            return new IntakeAnswer.Refused(400, "The row registry is not readable", unreadable);
        }

        var report = RowRegistryValidator.Validate(registry);
        if (!report.IsValid)
        {
            return new IntakeAnswer.Refused(422, "The row registry is not valid", report.Problems);
        }

        await store.PutOrchardDocumentAsync(OrchardDocuments.Rows, OrchardJson.Serialize(registry), caller.KeyId, cancellationToken);
        return new IntakeAnswer.Accepted(200, new RowsSaved(
            registry.Blocks.Count,
            registry.Blocks.Sum(b => b.Rows.Count),
            report.Warnings.Select(w => new FieldProblem(w.Path, w.Code, w.Message)).ToArray()), null);
    }

    /// <summary>Keeps the rates given in the body (JSON); the others keep their stored value.</summary>
    public async Task<IntakeAnswer> PutRatesAsync(ReadOnlyMemory<byte> body, Caller caller, CancellationToken cancellationToken)
    {
        var (rates, unreadable) = DocumentReader.Read<ReferenceRates>(body);
        return rates is null
            ? new IntakeAnswer.Refused(400, "The reference rates are not readable", unreadable)
            : await SaveRatesAsync(rates, caller, cancellationToken);
    }

    /// <summary>Keeps the rates given (the others keep their stored value); 200 with every rate, defaults filled in, or 422 naming each bad one.</summary>
    public async Task<IntakeAnswer> SaveRatesAsync(ReferenceRates given, Caller caller, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(given);
        ArgumentNullException.ThrowIfNull(caller);
        var report = ReferenceRatesValidator.Validate(given);
        if (!report.IsValid)
        {
            return new IntakeAnswer.Refused(422, "The reference rates are not valid", report.Problems);
        }

        var stored = await OrchardDocuments.RatesAsync(store, cancellationToken);
        var merged = new ReferenceRates(
            given.ManualSecondsPerTree ?? stored.ManualSecondsPerTree,
            given.PlatformSpeedKmh ?? stored.PlatformSpeedKmh,
            given.HandSecondsPerCut ?? stored.HandSecondsPerCut);
        await store.PutOrchardDocumentAsync(OrchardDocuments.Rates, OrchardJson.Serialize(merged), caller.KeyId, cancellationToken);
        return new IntakeAnswer.Accepted(200, ReferenceRates.Of(merged.ApplyTo(EstimateSettings.Default)), null);
    }

    /// <summary>The row registry (empty when none is stored).</summary>
    public Task<RowRegistry> RowsAsync(CancellationToken cancellationToken) => OrchardDocuments.RowsAsync(store, cancellationToken);

    /// <summary>Every rate, the stored ones and the defaults for the rest.</summary>
    public async Task<ReferenceRates> RatesAsync(CancellationToken cancellationToken) =>
        ReferenceRates.Of((await OrchardDocuments.RatesAsync(store, cancellationToken)).ApplyTo(EstimateSettings.Default));
}
