namespace Orchard.Service.Cli;

/// <summary>The command line asked for something that does not exist; the message says what.</summary>
internal sealed class UsageException(string message) : Exception(message);
