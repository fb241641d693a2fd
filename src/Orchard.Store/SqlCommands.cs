using System.Data.Common;
using System.Globalization;

namespace Orchard.Store;

/// <summary>
/// The few ADO.NET shapes both stores run their SQL through: a command with named parameters (null sent
/// as SQL NULL), a statement, one value, rows mapped one by one. Parameter names are the provider's own
/// (<c>$tree</c> for SQLite, <c>tree</c> for <c>@tree</c> with Npgsql).
/// </summary>
internal static class SqlCommands
{
    public static DbCommand Command(DbConnection connection, DbTransaction? transaction, string sql, (string Name, object? Value)[] parameters)
    {
        var command = connection.CreateCommand();
        command.Transaction = transaction;
        command.CommandText = sql;
        foreach (var (name, value) in parameters)
        {
            var parameter = command.CreateParameter();
            parameter.ParameterName = name;
            parameter.Value = value ?? DBNull.Value;
            command.Parameters.Add(parameter);
        }

        return command;
    }

    public static async Task<int> ExecuteAsync(DbConnection connection, DbTransaction? transaction, string sql, CancellationToken ct, params (string Name, object? Value)[] parameters)
    {
        await using var command = Command(connection, transaction, sql, parameters);
        return await command.ExecuteNonQueryAsync(ct).ConfigureAwait(false);
    }

    /// <summary>The first column of the first row, converted to <typeparamref name="T"/> (SQLite hands back 64-bit integers for every integer).</summary>
    public static async Task<T?> ScalarAsync<T>(DbConnection connection, DbTransaction? transaction, string sql, CancellationToken ct, params (string Name, object? Value)[] parameters)
    {
        await using var command = Command(connection, transaction, sql, parameters);
        var value = await command.ExecuteScalarAsync(ct).ConfigureAwait(false);
        if (value is null || value is DBNull)
        {
            return default;
        }

        if (value is T typed)
        {
            return typed;
        }

        var target = Nullable.GetUnderlyingType(typeof(T)) ?? typeof(T);
        return (T)Convert.ChangeType(value, target, CultureInfo.InvariantCulture);
    }

    public static async Task<IReadOnlyList<T>> QueryAsync<T>(DbConnection connection, DbTransaction? transaction, string sql, Func<DbDataReader, T> map, CancellationToken ct, params (string Name, object? Value)[] parameters)
    {
        await using var command = Command(connection, transaction, sql, parameters);
        await using var reader = await command.ExecuteReaderAsync(ct).ConfigureAwait(false);
        var rows = new List<T>();
        while (await reader.ReadAsync(ct).ConfigureAwait(false))
        {
            rows.Add(map(reader));
        }

        return rows;
    }
}
