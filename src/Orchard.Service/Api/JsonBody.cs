namespace Orchard.Service.Api;

/// <summary>
/// A request's body as it came (UTF-8 bytes), bound as an endpoint parameter; read once per request and
/// shared with <see cref="IdempotencyKey"/>. Kestrel bounds its size (413 beyond Orchard:MaxBodyBytes).
/// </summary>
public sealed class JsonBody
{
    private const string ItemKey = "orchard.body";

    private JsonBody(byte[] utf8) => Utf8 = utf8;

    public ReadOnlyMemory<byte> Utf8 { get; }

    public static async ValueTask<JsonBody?> BindAsync(HttpContext context) => new(await ReadAsync(context));

    internal static async Task<byte[]> ReadAsync(HttpContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        if (context.Items.TryGetValue(ItemKey, out var read) && read is byte[] bytes)
        {
            return bytes;
        }

        using var buffer = new MemoryStream();
        await context.Request.Body.CopyToAsync(buffer, context.RequestAborted);
        bytes = buffer.ToArray();
        context.Items[ItemKey] = bytes;
        return bytes;
    }
}
