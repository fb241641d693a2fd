using System.Text;
using Orchard.Core.Serialization;
using Orchard.Core.Validation;

namespace Orchard.Service.Application;

/// <summary>Reads a request body (UTF-8 JSON) as a document; what stopped it comes back as problems with JSON paths.</summary>
public static class DocumentReader
{
    public static (T? Value, IReadOnlyList<ValidationProblem> Problems) Read<T>(ReadOnlyMemory<byte> utf8)
        where T : class
    {
        var parsed = OrchardJson.Parse<T>(Encoding.UTF8.GetString(utf8.Span));
        return parsed.Succeeded ? (parsed.Value, []) : (null, [parsed.Problem!]);
    }
}
