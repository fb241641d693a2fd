using System.Xml.Linq;
using Microsoft.AspNetCore.DataProtection.Repositories;
using Orchard.Store;

namespace Orchard.Service.Auth;

/// <summary>
/// The data-protection key ring (which protects the review cookie and antiforgery tokens) kept in the
/// store, so every API replica reads the same keys and accepts every other replica's cookies. The keys are
/// stored as ASP.NET Core writes them (not encrypted at rest): the database is the trust boundary, as it is
/// for everything else the service keeps. The interface is synchronous; it is called when the ring is first
/// read and when it is refreshed (about daily), never per request.
/// </summary>
public sealed class StoreXmlRepository(IOrchardStore store) : IXmlRepository
{
    public IReadOnlyCollection<XElement> GetAllElements() =>
        store.GetProtectionKeysAsync(CancellationToken.None).GetAwaiter().GetResult().Select(k => XElement.Parse(k.Xml)).ToList();

    public void StoreElement(XElement element, string friendlyName)
    {
        ArgumentNullException.ThrowIfNull(element);
        var name = string.IsNullOrWhiteSpace(friendlyName) ? "key-" + Guid.NewGuid().ToString("N") : friendlyName;
        store.AddProtectionKeyAsync(new ProtectionKeyRecord(name, element.ToString(SaveOptions.DisableFormatting)), CancellationToken.None).GetAwaiter().GetResult();
    }
}
