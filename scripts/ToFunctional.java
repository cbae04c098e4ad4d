// Converts an ontology (RDF/XML, Turtle, OWL/XML ...) to OWL 2 functional syntax with the
// OWL API 3.4.3 bundled inside owlready2's HermiT.jar, so that the file the test reads is
// exactly the set of axioms the oracle reasoned over. Test tooling only (scripts/real-ontology).
//
// Usage: java -cp HermiT.jar:. ToFunctional IN OUT
import java.io.File;
import org.semanticweb.owlapi.apibinding.OWLManager;
import org.semanticweb.owlapi.io.OWLFunctionalSyntaxOntologyFormat;
import org.semanticweb.owlapi.model.OWLOntology;
import org.semanticweb.owlapi.model.OWLOntologyManager;
import org.semanticweb.owlapi.model.IRI;

public class ToFunctional {
    public static void main(String[] args) throws Exception {
        OWLOntologyManager m = OWLManager.createOWLOntologyManager();
        OWLOntology o = m.loadOntologyFromOntologyDocument(new File(args[0]));
        OWLFunctionalSyntaxOntologyFormat f = new OWLFunctionalSyntaxOntologyFormat();
        m.saveOntology(o, f, IRI.create(new File(args[1]).toURI()));
        System.err.println("axioms: " + o.getAxiomCount() + ", classes: " + o.getClassesInSignature().size());
    }
}
