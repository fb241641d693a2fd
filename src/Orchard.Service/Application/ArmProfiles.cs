using Orchard.Core.Model;
using Orchard.Core.Serialization;
using Orchard.Core.Validation;
using Orchard.Store;

namespace Orchard.Service.Application;

/// <summary>Registering an arm profile (admin): read strictly, validated, its id the one in the address, stored canonical and audited.</summary>
public sealed class ArmProfiles(IOrchardStore store)
{
    public async Task<IntakeAnswer> PutAsync(string armId, ReadOnlyMemory<byte> body, Caller caller, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(caller);
        var (profile, unreadable) = DocumentReader.Read<ArmProfile>(body);
        if (profile is null)
        {
            return new IntakeAnswer.Refused(400, "The arm profile is not readable", unreadable);
        }

        var problems = ArmProfileValidator.Validate(profile).Problems.ToList();
        if (profile.Id != armId)
        {
            problems.Add(ValidationProblem.Error("$.id", "armProfile.idMismatch", $"The profile's id '{profile.Id}' differs from the address '{armId}'."));
        }

        if (problems.Any(p => p.Severity == ProblemSeverity.Error))
        {
            return new IntakeAnswer.Refused(422, "The arm profile is not valid", problems);
        }

        await store.PutArmProfileAsync(armId, OrchardJson.Serialize(profile), caller.KeyId, cancellationToken);
        return new IntakeAnswer.Accepted(200, profile, null);
    }
}
