// Runs the oracle's own command line (org.semanticweb.HermiT.cli.CommandLine, the entry class
// scripts/hermit_oracle.py starts once per file) on many files inside one JVM, so a long
// differential run does not pay the JVM start-up and JIT warm-up on every file. Test tooling
// only (scripts/oracle-diff --batch); never shipped.
//
// Protocol: one request per stdin line, "INPUT<TAB>OUTPUT<TAB>LOG"; HermiT runs with
// `-k -c -P -o OUTPUT INPUT`, its stdout and stderr (and any exception it throws, as the
// uncaught-exception text a separate JVM would print) go to LOG, and one line
// "DONE<TAB>SECONDS" is written to stdout when the file is finished.
//
// Usage: java -cp <owlready2>/hermit:<owlready2>/hermit/HermiT.jar:DIR HermitBatch
import java.io.BufferedReader;
import java.io.FileOutputStream;
import java.io.InputStreamReader;
import java.io.PrintStream;

public class HermitBatch {
    public static void main(String[] args) throws Exception {
        PrintStream realOut = System.out;
        PrintStream realErr = System.err;
        BufferedReader in = new BufferedReader(new InputStreamReader(System.in, "UTF-8"));
        String line;
        while ((line = in.readLine()) != null) {
            String[] p = line.split("\t");
            if (p.length != 3) {
                realOut.println("BAD\t" + line);
                realOut.flush();
                continue;
            }
            long t0 = System.nanoTime();
            try (PrintStream log = new PrintStream(new FileOutputStream(p[2]), true, "UTF-8")) {
                System.setOut(log);
                System.setErr(log);
                try {
                    org.semanticweb.HermiT.cli.CommandLine.main(
                        new String[] {"-k", "-c", "-P", "-o", p[1], p[0]});
                } catch (Throwable t) {
                    log.println("Exception in thread \"main\" " + t);
                    t.printStackTrace(log);
                } finally {
                    System.setOut(realOut);
                    System.setErr(realErr);
                }
            }
            double secs = (System.nanoTime() - t0) / 1e9;
            realOut.println("DONE\t" + secs);
            realOut.flush();
        }
    }
}
