using Orchard.Core.Estimates;
using Orchard.Core.Model;
using Orchard.Core.Serialization;
using Orchard.Store;

namespace Orchard.Service.Application;

/// <summary>The orchard's documents in the store: the row registry and the reference rates, by name.</summary>
public static class OrchardDocuments
{
    public const string Rows = "rows";
    public const string Rates = "rates";

    /// <summary>The stored registry, or an empty one.</summary>
    public static async Task<RowRegistry> RowsAsync(IOrchardStore store, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(store);
        var json = await store.GetOrchardDocumentAsync(Rows, cancellationToken);
        return json is null ? RowRegistry.Empty : OrchardJson.Parse<RowRegistry>(json).Value ?? RowRegistry.Empty;
    }

    /// <summary>The stored rates, or none (every default applies).</summary>
    public static async Task<ReferenceRates> RatesAsync(IOrchardStore store, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(store);
        var json = await store.GetOrchardDocumentAsync(Rates, cancellationToken);
        return json is null ? new ReferenceRates() : OrchardJson.Parse<ReferenceRates>(json).Value ?? new ReferenceRates();
    }
}
