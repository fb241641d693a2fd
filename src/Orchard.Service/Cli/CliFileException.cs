namespace Orchard.Service.Cli;

/// <summary>A file named on the command line could not be read or written; the message names its full path. Exit code 1.</summary>
internal sealed class CliFileException(string message) : Exception(message);
