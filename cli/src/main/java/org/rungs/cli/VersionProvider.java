package org.rungs.cli;

import org.rungs.sampler.run.RunRecord;
import picocli.CommandLine;

/** Reports the build's version. */
final class VersionProvider implements CommandLine.IVersionProvider {
    @Override
    public String[] getVersion() {
        return new String[] {"rungs " + RunRecord.version()};
    }
}
